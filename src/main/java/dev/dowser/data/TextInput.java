package dev.dowser.data;

import java.io.BufferedInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.Reader;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.CharBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CoderResult;
import java.nio.charset.MalformedInputException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;

/** Strict UTF-8 text from bytes: a byte order mark is dropped, a malformed byte is an error. */
final class TextInput {

    static final int BUFFER_BYTES = 1 << 16;

    private TextInput() {
    }

    static Reader utf8(InputStream in) {
        BufferedInputStream buffered = new BufferedInputStream(in, BUFFER_BYTES);
        try {
            buffered.mark(3);
            byte[] head = buffered.readNBytes(3);
            boolean bom = head.length == 3 && (head[0] & 0xFF) == 0xEF && (head[1] & 0xFF) == 0xBB
                    && (head[2] & 0xFF) == 0xBF;
            if (!bom) {
                buffered.reset();
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return new StrictUtf8Reader(buffered);
    }

    /**
     * Decodes UTF-8 and hands out every character before a bad byte first, failing only when the
     * reader reaches it: the line a reader is on when it fails is then the bad byte's line. (A plain
     * decoding reader decodes a whole buffer ahead and fails while the reader is still lines before.)
     */
    static final class StrictUtf8Reader extends Reader {

        private final InputStream in;
        private final CharsetDecoder decoder = StandardCharsets.UTF_8.newDecoder()
                .onMalformedInput(CodingErrorAction.REPORT).onUnmappableCharacter(CodingErrorAction.REPORT);
        private final ByteBuffer bytes = ByteBuffer.allocate(BUFFER_BYTES).flip();
        private final CharBuffer chars = CharBuffer.allocate(BUFFER_BYTES).flip();
        private long bytesBefore;
        private CoderResult failed;
        private boolean ended;

        StrictUtf8Reader(InputStream in) {
            this.in = in;
        }

        @Override
        public int read(char[] into, int off, int len) throws IOException {
            if (len == 0) {
                return 0;
            }
            while (!chars.hasRemaining()) {
                if (failed != null) {
                    int bad = bytes.get(bytes.position()) & 0xFF;
                    throw new MalformedInputException(failed.length()) {
                        @Override
                        public String getMessage() {
                            return String.format("byte 0x%02X at byte %d", bad, bytesBefore + bytes.position() + 1);
                        }
                    };
                }
                if (ended) {
                    return -1;
                }
                fill();
            }
            int n = Math.min(len, chars.remaining());
            chars.get(into, off, n);
            return n;
        }

        private void fill() throws IOException {
            chars.clear();
            boolean eof = false;
            bytesBefore += bytes.position();
            bytes.compact();
            int got = bytes.hasRemaining() ? in.read(bytes.array(), bytes.position(), bytes.remaining()) : 0;
            if (got < 0) {
                eof = true;
            } else {
                bytes.position(bytes.position() + got);
            }
            bytes.flip();
            CoderResult r = decoder.decode(bytes, chars, eof);
            if (r.isError()) {
                failed = r;
            } else if (eof && r.isUnderflow()) {
                decoder.flush(chars);
                ended = true;
            }
            chars.flip();
        }

        @Override
        public void close() throws IOException {
            in.close();
        }
    }

    /** Turns a read failure into the importer's error, naming the line where it happened. */
    static ImportException failure(IOException e, long line) {
        if (e instanceof CharacterCodingException) {
            return new ImportException(line, null, "the file is not valid UTF-8 text (" + e.getMessage()
                    + "); save it as UTF-8 and try again", e);
        }
        return new ImportException(line, null, "cannot read the file: " + e.getMessage(), e);
    }
}
