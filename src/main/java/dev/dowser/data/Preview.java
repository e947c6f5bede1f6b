package dev.dowser.data;

import dev.dowser.records.RecordBatch;
import java.io.InputStream;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;

/**
 * The first records of a file, read before importing it, with what the mapping step needs to
 * suggest column roles and warn: per column, whether every value seen is a number, how many
 * sampled records have a value, and how many different values they have. The suggested id is a
 * column named like an id whose values are all different, else the first column whose values are
 * all different and look like ids (text without spaces, or whole numbers counting up); the label, a
 * column named like a label; the features, every numeric column left; the display, every column
 * but those two (as an import shows by default). The file may be cut anywhere: a broken last line
 * ends the preview.
 *
 * @param columns   the header
 * @param rows      up to the asked number of records, fields aligned with the header
 * @param kinds     per column, what every value seen is (empty values aside): {@code number}, {@code numbers}
 *                  (a JSON array of numbers, such as a trace or an embedding) or {@code text}
 * @param filled    per column, how many sampled records have a value in it
 * @param distinct  per column, how many different values the sampled records have in it
 * @param sampled   how many records were read to judge the columns
 * @param suggested the suggested roles
 */
public record Preview(List<String> columns, List<List<String>> rows, List<String> kinds, List<Integer> filled,
                      List<Integer> distinct, int sampled, ColumnRoles suggested) {

    public static final String NUMBER = "number";
    public static final String NUMBERS = "numbers";
    public static final String TEXT = "text";
    public static final int DEFAULT_ROWS = 10;
    /** Rows read to judge the columns; more than are shown. */
    static final int SAMPLE_ROWS = 200;
    /** Names that mean "the record's id" in files as people write them (compared in lower case, separators dropped). */
    static final Set<String> ID_NAMES = Set.of("id", "key", "record", "recordid", "rowid", "uid", "uuid", "guid",
            "index", "idx", "name", "sampleid", "itemid", "recordno", "rowno");
    static final Set<String> LABEL_NAMES = Set.of("label", "class", "target", "category", "condition", "y",
            "outcome", "diagnosis");
    /** An id is short; a longer text is something people read. */
    static final int MAX_ID_CHARS = 64;

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
        List<String> kinds = new ArrayList<>();
        List<Integer> filled = new ArrayList<>();
        List<Integer> distinct = new ArrayList<>();
        for (int c = 0; c < header.size(); c++) {
            boolean numbers = true;
            boolean arrays = true;
            int values = 0;
            Set<String> seen = new HashSet<>();
            for (List<String> row : sample) {
                String v = row.get(c);
                if (v == null || v.isEmpty()) {
                    continue;
                }
                values++;
                seen.add(v);
                numbers &= isNumber(v);
                arrays &= isNumberArray(v);
            }
            kinds.add(values == 0 ? TEXT : numbers ? NUMBER : arrays ? NUMBERS : TEXT);
            filled.add(values);
            distinct.add(seen.size());
        }
        Preview p = new Preview(header, List.copyOf(sample.subList(0, Math.min(showRows, sample.size()))), kinds,
                filled, distinct, sample.size(), null);
        return new Preview(p.columns, p.rows, kinds, filled, distinct, p.sampled, p.suggest(sample));
    }

    /** Whether every sampled record has a value in column {@code c}, all of them different. */
    public boolean unique(int c) {
        return filled.get(c) == sampled && distinct.get(c) == sampled;
    }

    private ColumnRoles suggest(List<List<String>> sample) {
        String id = null;
        String label = null;
        for (int c = 0; c < columns.size(); c++) {
            String name = normal(columns.get(c));
            if (id == null && idLike(columns.get(c)) && unique(c)) {
                id = columns.get(c);
            } else if (label == null && LABEL_NAMES.contains(name)) {
                label = columns.get(c);
            }
        }
        for (int c = 0; c < columns.size() && id == null; c++) {
            if (!columns.get(c).equals(label) && unique(c) && looksLikeIds(sample, c)) {
                id = columns.get(c);
            }
        }
        List<String> features = new ArrayList<>();
        List<String> display = new ArrayList<>();
        for (int c = 0; c < columns.size(); c++) {
            String name = columns.get(c);
            if (name.equals(label) || name.equals(id)) {
                continue;
            }
            display.add(name);
            if (!kinds.get(c).equals(TEXT)) {
                features.add(name);
            }
        }
        return new ColumnRoles(id, features, display, label, List.of());
    }

    /** A column name in lower case without separators: "Row ID", "row_id" and "rowId" are all "rowid". */
    static String normal(String name) {
        return name.toLowerCase(Locale.ROOT).replaceAll("[\\s_\\-.]", "");
    }

    /**
     * A name that says "id": one of the common ones, or a name ending in "id" as a word of its own
     * ("row_id", "Sample ID", "recordId"; not "humid" or "fluid").
     */
    static boolean idLike(String name) {
        return ID_NAMES.contains(normal(name)) || name.strip().matches("(?s).*([\\s_\\-.][iI][dD]|[a-z0-9]I[dD])");
    }

    /** Values that read like ids: short text without spaces, or whole numbers that count up. */
    private boolean looksLikeIds(List<List<String>> sample, int c) {
        if (kinds.get(c).equals(NUMBER)) {
            long previous = Long.MIN_VALUE;
            for (List<String> row : sample) {
                long v;
                try {
                    v = Long.parseLong(row.get(c).strip());
                } catch (NumberFormatException e) {
                    return false;
                }
                if (v <= previous) {
                    return false;
                }
                previous = v;
            }
            return true;
        }
        for (List<String> row : sample) {
            String v = row.get(c);
            if (v.length() > MAX_ID_CHARS || v.chars().anyMatch(Character::isWhitespace)) {
                return false;
            }
        }
        return true;
    }

    private static boolean isNumber(String v) {
        return NumberText.looksNumeric(v) && !NumberText.looksNonFinite(v);
    }

    /** A JSON array of finite numbers, as the importer turns into that many features. */
    private static boolean isNumberArray(String v) {
        String t = v.strip();
        if (t.length() < 2 || t.charAt(0) != '[' || t.charAt(t.length() - 1) != ']') {
            return false;
        }
        String inner = t.substring(1, t.length() - 1).strip();
        if (inner.isEmpty()) {
            return false;
        }
        for (String part : inner.split(",", -1)) {
            if (!isNumber(part.strip())) {
                return false;
            }
        }
        return true;
    }
}
