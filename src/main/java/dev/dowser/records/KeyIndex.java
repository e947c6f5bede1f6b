package dev.dowser.records;

import java.util.Arrays;
import java.util.function.LongFunction;

/**
 * Finds a record's place in its pool from its id, in 8 bytes a record: a sorted array of
 * (32-bit hash of the id, row) pairs packed into longs. A hash names a few candidate rows at most
 * (for a million ids about a hundred pairs share a hash), and each candidate's id is read back
 * to confirm. A map of strings to boxed rows took about 100 bytes a record.
 */
public final class KeyIndex {

    private final long[] packed;

    private KeyIndex(long[] packed) {
        this.packed = packed;
    }

    /** Collects the ids of a pool in row order, then seals the index. */
    public static final class Builder {

        private long[] packed = new long[1 << 12];
        private int size;

        public void add(String key, long row) {
            if (row < 0 || row > 0xFFFF_FFFFL) {
                throw new IllegalArgumentException("row " + row + " is beyond what the key index holds");
            }
            if (size == packed.length) {
                packed = Arrays.copyOf(packed, size * 2);
            }
            packed[size++] = pack(hash(key), row);
        }

        public KeyIndex build() {
            long[] sorted = Arrays.copyOf(packed, size);
            Arrays.sort(sorted);
            return new KeyIndex(sorted);
        }
    }

    /** The row whose id is {@code key}, or -1; {@code keyAt} reads a row's id back to confirm a candidate. */
    public long find(String key, LongFunction<String> keyAt) {
        int h = hash(key);
        int at = Arrays.binarySearch(packed, pack(h, 0));
        int first = at >= 0 ? at : -at - 1;
        for (int i = first; i < packed.length && (int) (packed[i] >>> 32) == h; i++) {
            long row = packed[i] & 0xFFFF_FFFFL;
            if (key.equals(keyAt.apply(row))) {
                return row;
            }
        }
        return -1;
    }

    public int size() {
        return packed.length;
    }

    /** The hash in the high half, the row in the low: sorting orders by hash, then by row. */
    private static long pack(int hash, long row) {
        return ((long) hash << 32) | row;
    }

    /** 32 bits of a 64-bit FNV-1a over the id's chars, mixed by SplitMix64's finaliser (Steele et al. 2014). */
    static int hash(String key) {
        long h = 0xcbf29ce484222325L;
        for (int i = 0; i < key.length(); i++) {
            h ^= key.charAt(i);
            h *= 0x100000001b3L;
        }
        h = (h ^ (h >>> 30)) * 0xBF58476D1CE4E5B9L;
        h = (h ^ (h >>> 27)) * 0x94D049BB133111EBL;
        return (int) (h ^ (h >>> 31));
    }
}
