package dev.dowser.records;

import java.nio.charset.StandardCharsets;
import java.util.Arrays;

/** A growable little-endian byte buffer with the few encodings the record blocks use. */
final class ByteSink {

    private byte[] buf;
    private int size;

    ByteSink(int initialBytes) {
        buf = new byte[Math.max(16, initialBytes)];
    }

    int size() {
        return size;
    }

    void clear() {
        size = 0;
    }

    /** Makes room for {@code n} more bytes and returns the array to write them into, from {@link #size}. */
    byte[] reserve(int n) {
        ensure(n);
        return buf;
    }

    /** Counts {@code n} bytes written directly into the array from {@link #reserve}. */
    void advance(int n) {
        size += n;
    }

    /** Drops everything written after the first {@code mark} bytes. */
    void truncate(int mark) {
        size = mark;
    }

    private void ensure(int extra) {
        if (size + extra > buf.length) {
            buf = Arrays.copyOf(buf, Math.max(buf.length * 2, size + extra));
        }
    }

    void put(byte b) {
        ensure(1);
        buf[size++] = b;
    }

    void putInt(int v) {
        ensure(4);
        for (int i = 0; i < 4; i++) {
            buf[size++] = (byte) (v >>> (8 * i));
        }
    }

    void putLong(long v) {
        ensure(8);
        for (int i = 0; i < 8; i++) {
            buf[size++] = (byte) (v >>> (8 * i));
        }
    }

    /** Unsigned LEB128: 7 bits a byte, high bit set while more follow. */
    void putVarint(int v) {
        ensure(5);
        while ((v & ~0x7F) != 0) {
            buf[size++] = (byte) ((v & 0x7F) | 0x80);
            v >>>= 7;
        }
        buf[size++] = (byte) v;
    }

    void putBytes(byte[] b, int off, int len) {
        ensure(len);
        System.arraycopy(b, off, buf, size, len);
        size += len;
    }

    /** A string as varint length plus UTF-8 bytes. */
    void putString(String s) {
        byte[] b = s.getBytes(StandardCharsets.UTF_8);
        putVarint(b.length);
        putBytes(b, 0, b.length);
    }

    void putSink(ByteSink other) {
        putBytes(other.buf, 0, other.size);
    }

    /** Reads the bytes written so far, without copying them. */
    java.io.InputStream asInputStream() {
        return new java.io.ByteArrayInputStream(buf, 0, size);
    }

    byte[] toArray() {
        return Arrays.copyOf(buf, size);
    }
}
