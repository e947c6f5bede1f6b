package dev.dowser.records;

/**
 * Packs the text of a number, exactly as written, two characters a byte: the digits and
 * {@code . - + e E}, ended by a 0xF nibble. Display fields of numeric files are mostly such
 * text, so this halves their size on disk without changing a single character.
 */
final class NumberPack {

    static final int MAX_CHARS = 64;
    private static final String ALPHABET = "0123456789.-+eE";
    private static final int END = 0xF;

    private NumberPack() {
    }

    private static final byte[] CODE = new byte[128];

    static {
        java.util.Arrays.fill(CODE, (byte) -1);
        for (int i = 0; i < ALPHABET.length(); i++) {
            CODE[ALPHABET.charAt(i)] = (byte) i;
        }
    }

    private static int code(char c) {
        return c < 128 ? CODE[c] : -1;
    }

    /**
     * Packs {@code a[from, from + n)} into {@code out} if it is made of the alphabet only; returns
     * false, with nothing written, if not.
     */
    static boolean tryWrite(char[] a, int from, int n, ByteSink out) {
        if (n == 0 || n > MAX_CHARS) {
            return false;
        }
        int bytes = n / 2 + 1;
        byte[] dst = out.reserve(bytes);
        int at = out.size();
        int end = from + n;
        for (int i = from; i <= end; i += 2) {
            int hi = i < end ? code(a[i]) : END;
            int lo = i + 1 < end ? code(a[i + 1]) : END;
            if ((hi | lo) < 0) {
                return false;
            }
            dst[at++] = (byte) ((hi << 4) | lo);
        }
        out.advance(bytes);
        return true;
    }

    /** Reads one packed number; returns its text, or null (but still advances) when {@code keep} is false. */
    static String read(ByteSource in, boolean keep) {
        StringBuilder s = keep ? new StringBuilder(16) : null;
        while (true) {
            int b = in.get() & 0xFF;
            int hi = b >>> 4;
            int lo = b & 0xF;
            if (hi == END) {
                break;
            }
            if (keep) {
                s.append(ALPHABET.charAt(hi));
            }
            if (lo == END) {
                break;
            }
            if (keep) {
                s.append(ALPHABET.charAt(lo));
            }
        }
        return keep ? s.toString() : null;
    }
}
