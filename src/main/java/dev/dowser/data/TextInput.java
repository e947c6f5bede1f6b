package dev.dowser.data;

import java.io.BufferedInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.Reader;
import java.io.UncheckedIOException;
import java.nio.charset.CharacterCodingException;
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
        return new InputStreamReader(buffered, StandardCharsets.UTF_8.newDecoder()
                .onMalformedInput(CodingErrorAction.REPORT)
                .onUnmappableCharacter(CodingErrorAction.REPORT));
    }

    /** Turns a read failure into the importer's error, naming the line where it happened. */
    static ImportException failure(IOException e, long line) {
        if (e instanceof CharacterCodingException) {
            return new ImportException(line, null, "the file is not valid UTF-8 text; save it as UTF-8 and try again", e);
        }
        return new ImportException(line, null, "cannot read the file: " + e.getMessage(), e);
    }
}
