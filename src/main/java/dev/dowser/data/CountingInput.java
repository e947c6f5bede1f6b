package dev.dowser.data;

import java.io.FilterInputStream;
import java.io.IOException;
import java.io.InputStream;

/** Counts the bytes read, and refuses to read past a limit so an oversized upload stops early. */
final class CountingInput extends FilterInputStream {

    private final long maxBytes;
    private volatile long count;

    CountingInput(InputStream in, long maxBytes) {
        super(in);
        this.maxBytes = maxBytes;
    }

    long count() {
        return count;
    }

    @Override
    public int read() throws IOException {
        int b = super.read();
        if (b >= 0) {
            advance(1);
        }
        return b;
    }

    @Override
    public int read(byte[] buf, int off, int len) throws IOException {
        int n = super.read(buf, off, len);
        if (n > 0) {
            advance(n);
        }
        return n;
    }

    private void advance(long n) {
        count += n;
        if (count > maxBytes) {
            throw ImportException.of("the file is larger than the limit of " + maxBytes + " bytes");
        }
    }

    @Override
    public boolean markSupported() {
        return false;
    }
}
