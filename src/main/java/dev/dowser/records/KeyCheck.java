package dev.dowser.records;

import java.io.BufferedInputStream;
import java.io.BufferedOutputStream;
import java.io.DataInputStream;
import java.io.DataOutputStream;
import java.io.EOFException;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.PriorityQueue;
import java.util.Set;

/**
 * Finds record ids that occur more than once in bounded memory, whatever the number of records:
 * 64-bit hashes of the ids are sorted in runs of fixed size, runs past the first are spilled to
 * temporary files, and a merge of the runs reports hashes seen twice. A repeated hash is only a
 * candidate; the caller confirms it against the ids themselves.
 */
public final class KeyCheck implements AutoCloseable {

    /** Hashes held in memory at once: 16 MiB. */
    static final int RUN_ENTRIES = 1 << 21;
    /** Candidates reported at most; a file with more repeated ids fails on the first anyway. */
    static final int MAX_CANDIDATES = 10_000;

    private final int runEntries;
    private final long[] buf;
    private int size;
    private final List<Path> runs = new ArrayList<>();

    public KeyCheck() {
        this(RUN_ENTRIES);
    }

    KeyCheck(int runEntries) {
        this.runEntries = runEntries;
        this.buf = new long[runEntries];
    }

    public void add(String key) {
        buf[size++] = hash(key);
        if (size == runEntries) {
            spill();
        }
    }

    /** The id's hash: FNV-1a, then the MurmurHash3 64-bit finaliser (Appleby 2011) to spread its bits. */
    public static long hash(String s) {
        long h = fnv1a(s);
        h ^= h >>> 33;
        h *= 0xff51afd7ed558ccdL;
        h ^= h >>> 33;
        h *= 0xc4ceb9fe1a85ec53L;
        h ^= h >>> 33;
        return h;
    }

    // FNV-1a 64 (Fowler, Noll & Vo) over the UTF-16 units; for ASCII ids that is the published byte-wise hash.
    static long fnv1a(String s) {
        long h = 0xcbf29ce484222325L;
        for (int i = 0; i < s.length(); i++) {
            h ^= s.charAt(i);
            h *= 0x100000001b3L;
        }
        return h;
    }

    private void spill() {
        Arrays.sort(buf, 0, size);
        try {
            Path run = Files.createTempFile("dowser-ids-", ".run");
            runs.add(run);
            try (DataOutputStream out = new DataOutputStream(new BufferedOutputStream(Files.newOutputStream(run),
                    1 << 16))) {
                for (int i = 0; i < size; i++) {
                    out.writeLong(buf[i]);
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write a temporary file while checking ids: " + e.getMessage(), e);
        }
        size = 0;
    }

    /** Hashes that were added more than once. */
    public Set<Long> repeated() {
        Set<Long> out = new HashSet<>();
        if (runs.isEmpty()) {
            Arrays.sort(buf, 0, size);
            for (int i = 1; i < size && out.size() < MAX_CANDIDATES; i++) {
                if (buf[i] == buf[i - 1]) {
                    out.add(buf[i]);
                }
            }
            return out;
        }
        if (size > 0) {
            spill();
        }
        record Head(long value, DataInputStream in) {
        }
        PriorityQueue<Head> heads = new PriorityQueue<>((a, b) -> Long.compare(a.value(), b.value()));
        List<DataInputStream> open = new ArrayList<>();
        try {
            for (Path run : runs) {
                DataInputStream in = new DataInputStream(new BufferedInputStream(Files.newInputStream(run), 1 << 16));
                open.add(in);
                heads.add(new Head(in.readLong(), in));
            }
            boolean first = true;
            long previous = 0;
            while (!heads.isEmpty() && out.size() < MAX_CANDIDATES) {
                Head h = heads.poll();
                if (!first && h.value() == previous) {
                    out.add(h.value());
                }
                first = false;
                previous = h.value();
                try {
                    heads.add(new Head(h.in().readLong(), h.in()));
                } catch (EOFException end) {
                    // This run is exhausted.
                }
            }
            return out;
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read a temporary file while checking ids: " + e.getMessage(), e);
        } finally {
            for (DataInputStream in : open) {
                try {
                    in.close();
                } catch (IOException ignored) {
                    // Read-only temporary file; deleted below.
                }
            }
        }
    }

    @Override
    public void close() {
        for (Path run : runs) {
            try {
                Files.deleteIfExists(run);
            } catch (IOException ignored) {
                // A leftover temporary file is harmless.
            }
        }
        runs.clear();
    }
}
