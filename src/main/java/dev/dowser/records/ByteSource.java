package dev.dowser.records;

import java.nio.charset.StandardCharsets;

/** Reads what {@link ByteSink} wrote, from a position in a byte array. */
final class ByteSource {

    private final byte[] buf;
    private int pos;

    ByteSource(byte[] buf, int pos) {
        this.buf = buf;
        this.pos = pos;
    }

    int position() {
        return pos;
    }

    byte get() {
        return buf[pos++];
    }

    int getInt() {
        int v = 0;
        for (int i = 0; i < 4; i++) {
            v |= (buf[pos++] & 0xFF) << (8 * i);
        }
        return v;
    }

    long getLong() {
        long v = 0;
        for (int i = 0; i < 8; i++) {
            v |= (buf[pos++] & 0xFFL) << (8 * i);
        }
        return v;
    }

    int getVarint() {
        int v = 0;
        int shift = 0;
        byte b;
        do {
            b = buf[pos++];
            v |= (b & 0x7F) << shift;
            shift += 7;
        } while ((b & 0x80) != 0);
        return v;
    }

    String getString() {
        int n = getVarint();
        String s = new String(buf, pos, n, StandardCharsets.UTF_8);
        pos += n;
        return s;
    }

    byte[] getBytes(int n) {
        byte[] out = new byte[n];
        System.arraycopy(buf, pos, out, 0, n);
        pos += n;
        return out;
    }

    void skip(int n) {
        pos += n;
    }

    byte[] array() {
        return buf;
    }
}
