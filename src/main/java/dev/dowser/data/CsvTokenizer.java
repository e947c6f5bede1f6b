package dev.dowser.data;

import java.io.IOException;
import java.io.Reader;
import java.util.Arrays;

/**
 * Splits RFC 4180 text into records of fields. Quoted fields may hold commas, line breaks and
 * doubled quotes; a quote anywhere else is an error, as is text after a closing quote. Lines end
 * in CRLF, LF or CR; empty lines are skipped. Fields go to a {@link Sink} as slices of a char
 * array, so no object is made per field; {@code dowser bench} measures what that buys.
 */
final class CsvTokenizer {

    static final int BUFFER_CHARS = 1 << 16;

    /** Receives the fields of one record in order. */
    interface Sink {
        void field(char[] chars, int offset, int length);
    }

    private final Reader in;
    private final int maxFieldChars;
    private final char[] buf = new char[BUFFER_CHARS];
    private char[] scratch = new char[256];
    private int pos;
    private int limit;
    private boolean eof;
    private long line = 1;
    private long recordLine;

    CsvTokenizer(Reader in, int maxFieldChars) {
        this.in = in;
        this.maxFieldChars = maxFieldChars;
    }

    /** The line the last record read started on. */
    long recordLine() {
        return recordLine;
    }

    /** The line the reader is on now. */
    long line() {
        return line;
    }

    /** Reads the next record, giving its fields to {@code sink}; false at the end of the text. */
    boolean next(Sink sink) throws IOException {
        while (true) {
            if (pos >= limit && !fill()) {
                return false;
            }
            char c = buf[pos];
            if (c == '\n') {
                pos++;
                line++;
            } else if (c == '\r') {
                pos++;
                skipLfAfterCr();
                line++;
            } else {
                break;
            }
        }
        recordLine = line;
        while (true) {
            if (pos >= limit && !fill()) {
                sink.field(buf, 0, 0);
                return true;
            }
            boolean endOfRecord = buf[pos] == '"' ? quoted(sink) : unquoted(sink);
            if (endOfRecord) {
                return true;
            }
        }
    }

    /** Reads an unquoted field and its terminator; true when the record ended. */
    private boolean unquoted(Sink sink) throws IOException {
        int start = pos;
        int spilled = 0;
        while (true) {
            if (pos >= limit) {
                spilled = spill(spilled, start, pos);
                if (!fill()) {
                    sink.field(scratch, 0, spilled);
                    return true;
                }
                start = pos;
            }
            char c = buf[pos];
            if (c == ',' || c == '\n' || c == '\r') {
                if (spilled > 0) {
                    spilled = spill(spilled, start, pos);
                    sink.field(scratch, 0, spilled);
                } else {
                    checkLength(pos - start);
                    sink.field(buf, start, pos - start);
                }
                return terminator(c);
            }
            if (c == '"') {
                throw new ImportException(line, null, "a quote inside an unquoted field; quote the whole field and"
                        + " double the quotes inside it (\"\")");
            }
            pos++;
            if (pos - start + spilled > maxFieldChars) {
                checkLength(pos - start + spilled);
            }
        }
    }

    /** Appends buf[from, to) to the scratch array after its first {@code used} chars. */
    private int spill(int used, int from, int to) {
        int n = to - from;
        checkLength(used + n);
        if (used + n > scratch.length) {
            scratch = Arrays.copyOf(scratch, Math.max(scratch.length * 2, used + n));
        }
        System.arraycopy(buf, from, scratch, used, n);
        return used + n;
    }

    /** Reads a quoted field and its terminator; true when the record ended. */
    private boolean quoted(Sink sink) throws IOException {
        long opened = line;
        pos++;
        int n = 0;
        while (true) {
            if (pos >= limit && !fill()) {
                throw new ImportException(opened, null, "a quoted field opened on this line is not closed before"
                        + " the end of the file");
            }
            char c = buf[pos++];
            if (c == '"') {
                if (pos >= limit && !fill()) {
                    sink.field(scratch, 0, n);
                    return true;
                }
                if (buf[pos] == '"') {
                    pos++;
                } else {
                    char t = buf[pos];
                    if (t != ',' && t != '\n' && t != '\r') {
                        throw new ImportException(line, null, "text after the closing quote of a quoted field; a"
                                + " quote inside a quoted field must be doubled (\"\")");
                    }
                    sink.field(scratch, 0, n);
                    return terminator(t);
                }
            } else if (c == '\n') {
                line++;
            } else if (c == '\r') {
                if (pos >= limit) {
                    fill();
                }
                if (pos >= limit || buf[pos] != '\n') {
                    line++;
                }
            }
            if (n == maxFieldChars) {
                checkLength(n + 1);
            }
            if (n == scratch.length) {
                scratch = Arrays.copyOf(scratch, scratch.length * 2);
            }
            scratch[n++] = c;
        }
    }

    /** Consumes the comma or line end at {@code pos}; true when it ended the record. */
    private boolean terminator(char c) throws IOException {
        pos++;
        if (c == ',') {
            return false;
        }
        if (c == '\r') {
            skipLfAfterCr();
        }
        line++;
        return true;
    }

    private void skipLfAfterCr() throws IOException {
        if (pos >= limit) {
            fill();
        }
        if (pos < limit && buf[pos] == '\n') {
            pos++;
        }
    }

    private void checkLength(int n) {
        if (n > maxFieldChars) {
            throw new ImportException(line, null, "a field is longer than the limit of " + maxFieldChars
                    + " characters");
        }
    }

    private boolean fill() throws IOException {
        if (eof) {
            return false;
        }
        int n = in.read(buf, 0, buf.length);
        if (n <= 0) {
            eof = true;
            pos = 0;
            limit = 0;
            return false;
        }
        pos = 0;
        limit = n;
        return true;
    }
}
