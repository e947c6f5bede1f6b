package dev.dowser.data;

import dev.dowser.records.RecordBatch;

import java.io.IOException;
import java.io.InputStream;
import java.io.Reader;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;

/** CSV with a header row naming the columns, read by {@link CsvTokenizer}. */
final class CsvRowReader implements RowReader {

    private final Reader text;
    private final CsvTokenizer tokenizer;
    private final List<String> header;

    CsvRowReader(InputStream in, int maxFieldChars) {
        this.text = TextInput.utf8(in);
        this.tokenizer = new CsvTokenizer(text, maxFieldChars);
        try {
            List<String> names = new ArrayList<>();
            if (!read((chars, off, n) -> names.add(new String(chars, off, n)))) {
                throw ImportException.of("the file is empty; a CSV file needs a header row naming its columns");
            }
            this.header = List.copyOf(checkHeader(names, tokenizer.recordLine()));
        } catch (RuntimeException e) {
            close();
            throw e;
        }
    }

    static List<String> checkHeader(List<String> names, long line) {
        Set<String> seen = new HashSet<>();
        boolean allNumbers = true;
        List<String> stripped = new ArrayList<>(names.size());
        for (int i = 0; i < names.size(); i++) {
            String name = names.get(i).strip();
            if (name.isEmpty()) {
                throw new ImportException(line, null, "column " + (i + 1) + " of the header has no name;"
                        + " every column needs a name");
            }
            if (!seen.add(name)) {
                throw new ImportException(line, null, "the header names column '" + name + "' twice");
            }
            allNumbers &= NumberText.looksNumeric(name);
            stripped.add(name);
        }
        if (allNumbers) {
            throw new ImportException(line, null, "the first line holds only numbers, so it looks like data, not a"
                    + " header; add a header row naming the columns");
        }
        return stripped;
    }

    private boolean read(CsvTokenizer.Sink sink) {
        try {
            return tokenizer.next(sink);
        } catch (IOException e) {
            throw TextInput.failure(e, tokenizer.line());
        }
    }

    @Override
    public List<String> header() {
        return header;
    }

    @Override
    public boolean next(RecordBatch batch) {
        batch.beginRecord(tokenizer.line());
        if (!read(batch::field)) {
            return false;
        }
        if (batch.fieldsSoFar() != header.size()) {
            throw new ImportException(tokenizer.recordLine(), null, "the record has " + batch.fieldsSoFar()
                    + (batch.fieldsSoFar() == 1 ? " field" : " fields") + " where the header has " + header.size()
                    + "; quote fields that contain commas");
        }
        batch.setLine(tokenizer.recordLine());
        batch.endRecord();
        return true;
    }

    @Override
    public void close() {
        try {
            text.close();
        } catch (IOException ignored) {
            // Closing a reader we only read from: nothing is lost.
        }
    }
}
