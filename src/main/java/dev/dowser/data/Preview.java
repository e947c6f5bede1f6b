package dev.dowser.data;

import dev.dowser.records.RecordBatch;
import java.io.InputStream;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;

/**
 * The first records of a file, read before importing it, with a suggestion of column roles for
 * the mapping step: the id (a column named like an id whose values are all different), the label
 * (a column named like a label), the features (every numeric column left) and the display (every
 * column but those two, as an import shows by default). The file may be cut anywhere: a broken last line ends the preview.
 *
 * @param columns  the header
 * @param rows     up to the asked number of records, fields aligned with the header
 * @param numeric  per column, whether every value seen reads as a number (empty values aside)
 */
public record Preview(List<String> columns, List<List<String>> rows, List<Boolean> numeric, ColumnRoles suggested) {

    public static final int DEFAULT_ROWS = 10;
    /** Rows read to judge the columns; more than are shown. */
    static final int SAMPLE_ROWS = 200;
    static final Set<String> ID_NAMES = Set.of("id", "key", "record", "record_id", "uid", "name");
    static final Set<String> LABEL_NAMES = Set.of("label", "class", "target", "category", "condition", "y",
            "outcome", "diagnosis");

    public static Preview of(InputStream head, FileFormat format, int showRows) {
        List<String> header;
        List<List<String>> sample = new ArrayList<>();
        RowReader reader = format == FileFormat.CSV ? new CsvRowReader(head, ImportSpec.DEFAULT_MAX_FIELD_CHARS)
                : new JsonLinesRowReader(head, ImportSpec.DEFAULT_MAX_FIELD_CHARS);
        try (reader) {
            header = reader.header();
            RecordBatch batch = RecordBatch.forReading(header.size(), 1);
            while (sample.size() < SAMPLE_ROWS) {
                boolean more;
                try {
                    more = reader.next(batch);
                } catch (ImportException e) {
                    if (sample.isEmpty()) {
                        throw e;
                    }
                    break; // the head of the file was cut inside a record
                }
                if (!more) {
                    break;
                }
                List<String> row = new ArrayList<>(header.size());
                for (int c = 0; c < header.size(); c++) {
                    row.add(batch.text(0, c));
                }
                sample.add(row);
                batch = RecordBatch.forReading(header.size(), 1);
            }
        }
        if (sample.isEmpty()) {
            throw ImportException.of("the file has no records after its header");
        }
        List<Boolean> numeric = new ArrayList<>();
        for (int c = 0; c < header.size(); c++) {
            boolean all = true;
            boolean any = false;
            for (List<String> row : sample) {
                String v = row.get(c);
                if (v == null || v.isEmpty()) {
                    continue;
                }
                any = true;
                all &= NumberText.looksNumeric(v) && !NumberText.looksNonFinite(v);
            }
            numeric.add(any && all);
        }
        return new Preview(header, List.copyOf(sample.subList(0, Math.min(showRows, sample.size()))),
                numeric, suggest(header, sample, numeric));
    }

    private static ColumnRoles suggest(List<String> header, List<List<String>> sample, List<Boolean> numeric) {
        String id = null;
        String label = null;
        for (int c = 0; c < header.size(); c++) {
            String name = header.get(c).toLowerCase(Locale.ROOT).strip();
            if (id == null && ID_NAMES.contains(name) && allDifferent(sample, c)) {
                id = header.get(c);
            } else if (label == null && LABEL_NAMES.contains(name)) {
                label = header.get(c);
            }
        }
        List<String> features = new ArrayList<>();
        List<String> display = new ArrayList<>();
        for (int c = 0; c < header.size(); c++) {
            String name = header.get(c);
            if (name.equals(label) || name.equals(id)) {
                continue;
            }
            display.add(name);
            if (numeric.get(c)) {
                features.add(name);
            }
        }
        return new ColumnRoles(id, features, display, label, List.of());
    }

    private static boolean allDifferent(List<List<String>> sample, int c) {
        Set<String> seen = new HashSet<>();
        for (List<String> row : sample) {
            if (!seen.add(row.get(c))) {
                return false;
            }
        }
        return true;
    }
}
