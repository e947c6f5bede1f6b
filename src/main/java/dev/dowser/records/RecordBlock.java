package dev.dowser.records;

import java.io.IOException;
import java.io.InputStream;
import java.util.Arrays;

/**
 * The storage layout of a block of consecutive records, one row of {@code record_blocks}.
 * Sections are laid out one after another so a reader can go straight to the one it needs
 * (the model reads only features; a person's page only display values):
 *
 * <pre>
 * header   int magic, int n, int keysAt, int labelsAt, int displayAt, int featuresAt, int displayCols
 * lines    n longs: the line of the import file each record started on
 * keys     n strings (varint length + UTF-8)
 * labels   n entries: varint 0 for none, else varint (length + 1) + UTF-8
 * display  n x displayCols values: tag 0 missing; 1 string; 2 number text packed by {@link NumberPack}
 * features n entries: varint byte length + the raw float32 bytes
 * </pre>
 *
 * All integers little-endian. Storing blocks rather than one row per record lets an import
 * write a million records at disk speed instead of index-update speed (measured in DEVELOPERS.md).
 */
public final class RecordBlock {

    static final int MAGIC = 0x44574231; // "DWB1"
    static final int HEADER_BYTES = 28;
    static final byte MISSING = 0;
    static final byte TEXT = 1;
    static final byte NUMBER = 2;

    private final byte[] payload;
    private final int n;
    private final int keysAt;
    private final int labelsAt;
    private final int displayAt;
    private final int featuresAt;
    private final int displayCols;

    /**
     * Reads a block's sections up to, not including, its features: what a person's page needs,
     * without the float bytes that make up most of a block (its LOB is streamed, so the rest is
     * never read).
     */
    public static RecordBlock readHead(InputStream stream) throws IOException {
        return readUpTo(stream, 20);
    }

    /** Reads the block up to the section whose offset the header holds at byte {@code offsetAt}. */
    private static RecordBlock readUpTo(InputStream stream, int offsetAt) throws IOException {
        byte[] header = stream.readNBytes(HEADER_BYTES);
        if (header.length < HEADER_BYTES) {
            throw new DamagedBlockException("a record block is damaged (" + header.length + " header bytes)");
        }
        int end = new ByteSource(header, offsetAt).getInt();
        byte[] head = Arrays.copyOf(header, end);
        int read = stream.readNBytes(head, HEADER_BYTES, end - HEADER_BYTES);
        if (read != end - HEADER_BYTES) {
            throw new DamagedBlockException("a record block is damaged (ends at byte " + (HEADER_BYTES + read) + ")");
        }
        return new RecordBlock(head);
    }

    /** Reads only a block's header, lines and keys: enough to confirm which id a row has. */
    public static RecordBlock readKeys(InputStream stream) throws IOException {
        return readUpTo(stream, 12);
    }

    public RecordBlock(byte[] payload) {
        ByteSource in = new ByteSource(payload, 0);
        if (in.getInt() != MAGIC) {
            throw new DamagedBlockException("a record block has an unknown layout; was it written by a newer Dowser?");
        }
        this.payload = payload;
        this.n = in.getInt();
        this.keysAt = in.getInt();
        this.labelsAt = in.getInt();
        this.displayAt = in.getInt();
        this.featuresAt = in.getInt();
        this.displayCols = in.getInt();
    }

    public int size() {
        return n;
    }

    public long[] lines() {
        ByteSource in = new ByteSource(payload, HEADER_BYTES);
        long[] out = new long[n];
        for (int i = 0; i < n; i++) {
            out[i] = in.getLong();
        }
        return out;
    }

    public String[] keys() {
        ByteSource in = new ByteSource(payload, keysAt);
        String[] out = new String[n];
        for (int i = 0; i < n; i++) {
            out[i] = in.getString();
        }
        return out;
    }

    /** The id of record {@code index} alone, skipping the ones before it undecoded. */
    public String key(int index) {
        ByteSource in = new ByteSource(payload, keysAt);
        for (int i = 0; i < index; i++) {
            in.skip(in.getVarint());
        }
        return in.getString();
    }

    public String[] knownLabels() {
        ByteSource in = new ByteSource(payload, labelsAt);
        String[] out = new String[n];
        for (int i = 0; i < n; i++) {
            int len = in.getVarint();
            if (len > 0) {
                out[i] = new String(in.getBytes(len - 1), java.nio.charset.StandardCharsets.UTF_8);
            }
        }
        return out;
    }

    /** Display values of records {@code from} (inclusive) to {@code to} (exclusive) of this block. */
    public String[][] display(int from, int to) {
        int[] wanted = new int[to - from];
        Arrays.setAll(wanted, i -> from + i);
        return display(wanted);
    }

    /**
     * Display values of the records at {@code wanted} (ascending indices in this block), in that
     * order; the values of records in between are skipped, not decoded.
     */
    public String[][] display(int[] wanted) {
        ByteSource in = new ByteSource(payload, displayAt);
        String[][] out = new String[wanted.length][];
        int last = wanted.length == 0 ? -1 : wanted[wanted.length - 1];
        int next = 0;
        for (int i = 0; i <= last; i++) {
            boolean keep = i == wanted[next];
            String[] row = keep ? new String[displayCols] : null;
            for (int c = 0; c < displayCols; c++) {
                byte tag = in.get();
                String v = switch (tag) {
                    case MISSING -> null;
                    case TEXT -> keep ? in.getString() : skipString(in);
                    case NUMBER -> NumberPack.read(in, keep);
                    default -> throw new DamagedBlockException("a record block is damaged (display tag " + tag + ")");
                };
                if (keep) {
                    row[c] = v;
                }
            }
            if (keep) {
                out[next++] = row;
            }
        }
        return out;
    }

    private static String skipString(ByteSource in) {
        in.skip(in.getVarint());
        return null;
    }

    /** Calls {@code sink} with each record's index in the block and its raw feature bytes. */
    public void features(FeatureVisitor sink) {
        if (featuresAt >= payload.length && n > 0) {
            throw new IllegalStateException("this block was read without its features");
        }
        ByteSource in = new ByteSource(payload, featuresAt);
        for (int i = 0; i < n; i++) {
            int len = in.getVarint();
            sink.visit(i, payload, in.position(), len);
            in.skip(len);
        }
    }

    /** Receives one record's raw features as a slice of the block's bytes. */
    @FunctionalInterface
    public interface FeatureVisitor {
        void visit(int index, byte[] bytes, int offset, int length);
    }

    /** A sealed block: its length in bytes and a stream over them. */
    public static final class Sealed {

        private final ByteSink bytes;

        private Sealed(ByteSink bytes) {
            this.bytes = bytes;
        }

        public int length() {
            return bytes.size();
        }

        public InputStream stream() {
            return bytes.asInputStream();
        }
    }

    /** Collects records into the sections of one block. */
    public static final class Builder {

        private final int displayCols;
        private final ByteSink lines = new ByteSink(8 * 1024);
        private final ByteSink keys = new ByteSink(16 * 1024);
        private final ByteSink labels = new ByteSink(4 * 1024);
        private final ByteSink display = new ByteSink(256 * 1024);
        private final ByteSink features = new ByteSink(256 * 1024);
        private final ByteSink reused = new ByteSink(RecordBatch.TARGET_CHARS * 2);
        private int n;

        public Builder(int displayCols) {
            this.displayCols = displayCols;
        }

        /** Lays out every record of the batch. */
        public void addAll(RecordBatch batch) {
            if (batch.displayCols() != displayCols) {
                throw new IllegalArgumentException("expected " + displayCols + " display columns, got "
                        + batch.displayCols());
            }
            char[] text = batch.chars();
            for (int r = 0; r < batch.rows(); r++) {
                lines.putLong(batch.line(r));
                keys.putString(batch.key(r));
                String knownLabel = batch.label(r);
                if (knownLabel == null) {
                    labels.putVarint(0);
                } else {
                    byte[] b = knownLabel.getBytes(java.nio.charset.StandardCharsets.UTF_8);
                    labels.putVarint(b.length + 1);
                    labels.putBytes(b, 0, b.length);
                }
                for (int c = 0; c < displayCols; c++) {
                    int len = batch.displayLength(r, c);
                    if (len == RecordBatch.MISSING) {
                        display.put(MISSING);
                        continue;
                    }
                    int start = batch.displayStart(r, c);
                    int tagAt = display.size();
                    display.put(NUMBER);
                    if (!NumberPack.tryWrite(text, start, len, display)) {
                        display.truncate(tagAt);
                        display.put(TEXT);
                        display.putString(new String(text, start, len));
                    }
                }
                features.putVarint(batch.featureLength[r]);
                features.putBytes(batch.features, batch.featureStart[r], batch.featureLength[r]);
                n++;
            }
        }

        public int size() {
            return n;
        }

        int bytes() {
            return HEADER_BYTES + lines.size() + keys.size() + labels.size() + display.size() + features.size();
        }

        public byte[] seal() {
            ByteSink out = new ByteSink(bytes());
            sealInto(out);
            return out.toArray();
        }

        /**
         * The finished block in a buffer this builder reuses, valid until its next seal or clear:
         * lets a writer store block after block without a new array each time.
         */
        public Sealed sealInPlace() {
            sealInto(reused);
            return new Sealed(reused);
        }

        /** Writes the finished block into {@code out}, which is cleared first. */
        void sealInto(ByteSink out) {
            out.clear();
            int keysAt = HEADER_BYTES + lines.size();
            int labelsAt = keysAt + keys.size();
            int displayAt = labelsAt + labels.size();
            int featuresAt = displayAt + display.size();
            out.putInt(MAGIC);
            out.putInt(n);
            out.putInt(keysAt);
            out.putInt(labelsAt);
            out.putInt(displayAt);
            out.putInt(featuresAt);
            out.putInt(displayCols);
            out.putSink(lines);
            out.putSink(keys);
            out.putSink(labels);
            out.putSink(display);
            out.putSink(features);
        }

        public void clear() {
            lines.clear();
            keys.clear();
            labels.clear();
            display.clear();
            features.clear();
            n = 0;
        }
    }
}
