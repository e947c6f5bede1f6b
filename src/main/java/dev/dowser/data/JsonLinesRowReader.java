package dev.dowser.data;

import dev.dowser.records.RecordBatch;

import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonToken;
import com.fasterxml.jackson.core.exc.StreamConstraintsException;
import dev.dowser.json.Json;
import java.io.IOException;
import java.io.InputStream;
import java.io.Reader;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * JSON Lines: one object per line. The first object's fields are the columns; a later object may
 * leave a field out (missing) but may not bring a new one. Numbers keep their text; an array of
 * numbers is kept as its JSON text, for an embedding column.
 */
final class JsonLinesRowReader implements RowReader {

    private final Reader reader;
    private final int maxFieldChars;
    private final int maxLineChars;
    /** Decoded text, read in chunks: one read() call per character went through the decoder each time. */
    private final char[] chunk = new char[1 << 16];
    private int chunkPos;
    private int chunkEnd;
    private char[] line = new char[1 << 12];
    private int lineLength;
    private final List<String> header;
    private final Map<String, Integer> index = new HashMap<>();
    private String[] values;
    private String[] pending;
    private long lineNo;
    private long recordLine;
    private long firstLine;

    JsonLinesRowReader(InputStream in, int maxFieldChars) {
        this.reader = TextInput.utf8(in);
        this.maxFieldChars = maxFieldChars;
        this.maxLineChars = (int) Math.min(Integer.MAX_VALUE - 16, 64L * maxFieldChars);
        try {
            List<String> names = new ArrayList<>();
            List<String> first = new ArrayList<>();
            if (!nextLine()) {
                throw ImportException.of("the file is empty; JSON Lines needs one object per line");
            }
            parseObject(names, first, true);
            if (names.isEmpty()) {
                throw new ImportException(lineNo, null, "the first object has no fields; its fields name the columns");
            }
            this.header = List.copyOf(names);
            for (int i = 0; i < header.size(); i++) {
                index.put(header.get(i), i);
            }
            this.values = new String[header.size()];
            this.pending = first.toArray(new String[0]);
            this.firstLine = recordLine;
        } catch (RuntimeException e) {
            close();
            throw e;
        }
    }

    @Override
    public List<String> header() {
        return header;
    }

    @Override
    public boolean next(RecordBatch batch) {
        if (pending != null) {
            System.arraycopy(pending, 0, values, 0, values.length);
            pending = null;
            batch.beginRecord(firstLine);
        } else {
            if (!nextLine()) {
                return false;
            }
            Arrays.fill(values, null);
            parseObject(null, null, false);
            batch.beginRecord(recordLine);
        }
        for (String v : values) {
            batch.field(v);
        }
        batch.endRecord();
        return true;
    }

    /** Reads the next non-blank line into {@code line}; false at the end of the file. */
    private boolean nextLine() {
        try {
            while (true) {
                lineLength = 0;
                boolean any = false;
                boolean ended = false;
                while (!ended) {
                    if (chunkPos == chunkEnd) {
                        chunkEnd = reader.read(chunk, 0, chunk.length);
                        chunkPos = 0;
                        if (chunkEnd < 0) {
                            chunkEnd = 0;
                            break;
                        }
                    }
                    int from = chunkPos;
                    while (chunkPos < chunkEnd && chunk[chunkPos] != '\n') {
                        chunkPos++;
                    }
                    append(from, chunkPos - from);
                    any |= chunkPos > from;
                    if (chunkPos < chunkEnd) {
                        chunkPos++;
                        ended = true;
                    }
                }
                if (!ended && !any) {
                    return false;
                }
                lineNo++;
                if (!blank()) {
                    recordLine = lineNo;
                    return true;
                }
                if (!ended) {
                    return false;
                }
            }
        } catch (IOException e) {
            throw TextInput.failure(e, lineNo + 1);
        }
    }

    private void append(int from, int n) {
        if (lineLength + n > maxLineChars) {
            throw new ImportException(lineNo + 1, null, "the line is longer than the limit of " + maxLineChars
                    + " characters");
        }
        if (lineLength + n > line.length) {
            line = Arrays.copyOf(line, Math.max(lineLength + n, line.length * 2));
        }
        System.arraycopy(chunk, from, line, lineLength, n);
        lineLength += n;
    }

    private boolean blank() {
        for (int i = 0; i < lineLength; i++) {
            if (!Character.isWhitespace(line[i])) {
                return false;
            }
        }
        return true;
    }

    private void parseObject(List<String> names, List<String> firstValues, boolean first) {
        try (JsonParser p = Json.mapper().getFactory().createParser(line, 0, lineLength)) {
            if (p.nextToken() != JsonToken.START_OBJECT) {
                throw new ImportException(recordLine, null, "expected a JSON object such as {\"a\": 1}");
            }
            JsonToken t;
            while ((t = p.nextToken()) == JsonToken.FIELD_NAME) {
                String name = p.currentName();
                p.nextToken();
                String value = valueText(p, name);
                if (first) {
                    if (index.putIfAbsent(name, names.size()) != null) {
                        throw new ImportException(recordLine, name, "the object names this field twice");
                    }
                    names.add(name);
                    firstValues.add(value);
                } else {
                    Integer at = index.get(name);
                    if (at == null) {
                        throw new ImportException(recordLine, name, "this field is not among the fields of the first"
                                + " line (" + String.join(", ", header) + ")");
                    }
                    values[at] = value;
                }
            }
            if (t != JsonToken.END_OBJECT || p.nextToken() != null) {
                throw new ImportException(recordLine, null, "expected exactly one JSON object on the line");
            }
        } catch (StreamConstraintsException e) {
            throw new ImportException(recordLine, null, "a value is longer or deeper than allowed: "
                    + e.getOriginalMessage());
        } catch (JsonProcessingException e) {
            throw new ImportException(recordLine, null, "malformed JSON: " + e.getOriginalMessage(), e);
        } catch (IOException e) {
            throw TextInput.failure(e, recordLine);
        }
    }

    private String valueText(JsonParser p, String name) throws IOException {
        JsonToken t = p.currentToken();
        String text = switch (t) {
            case VALUE_NULL -> null;
            case VALUE_STRING -> {
                String s = p.getText();
                yield s.isEmpty() ? null : s;
            }
            case VALUE_NUMBER_INT, VALUE_NUMBER_FLOAT, VALUE_TRUE, VALUE_FALSE -> p.getText();
            case START_ARRAY -> numberArray(p, name);
            // An object is kept as its JSON text (shown to people, or one category as a feature), so
            // that an export's labels_by_person imports back.
            case START_OBJECT -> Json.write(Json.treeAt(p));
            default -> throw new ImportException(recordLine, name, "unexpected " + t);
        };
        if (text != null && text.length() > maxFieldChars) {
            throw new ImportException(recordLine, name, "the value is longer than the limit of " + maxFieldChars
                    + " characters");
        }
        return text;
    }

    private String numberArray(JsonParser p, String name) throws IOException {
        StringBuilder s = new StringBuilder("[");
        JsonToken t;
        while ((t = p.nextToken()) != JsonToken.END_ARRAY) {
            if (t != JsonToken.VALUE_NUMBER_INT && t != JsonToken.VALUE_NUMBER_FLOAT) {
                throw new ImportException(recordLine, name, "an embedding must be an array of numbers only");
            }
            if (s.length() > 1) {
                s.append(',');
            }
            s.append(p.getText());
            if (s.length() > maxFieldChars) {
                throw new ImportException(recordLine, name, "the value is longer than the limit of " + maxFieldChars
                        + " characters");
            }
        }
        return s.append(']').toString();
    }

    @Override
    public void close() {
        try {
            reader.close();
        } catch (IOException ignored) {
            // Closing a reader we only read from: nothing is lost.
        }
    }
}
