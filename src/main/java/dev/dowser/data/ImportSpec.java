package dev.dowser.data;

import dev.dowser.store.PoolWriter;
import java.util.List;

/**
 * What to import and how each column is used. Null or empty lists mean the defaults: features
 * are every column except the id and label columns; display is every column except the label
 * column (the id is always shown as the record's id).
 *
 * @param poolName        the new pool's name
 * @param format          the file's format
 * @param idColumn        column holding each record's id; null to use the line number
 * @param featureColumns  columns the model sees
 * @param displayColumns  columns a person sees
 * @param labelColumn     column of labels already given; null for none
 * @param classes         the label set in key order; empty to take the values seen in the label column
 * @param categorical     feature columns to one-hot encode even when their values look like numbers
 * @param maxLevels       most distinct values a categorical column may have
 * @param maxFieldChars   longest field accepted, in characters
 * @param maxBytes        largest file accepted, in bytes
 * @param importedBy      who the labels carried in by the file are attributed to
 * @param missingTokens   field values that mean "missing", beside an empty field: in a feature
 *                        column they set its missing-value indicator rather than make a category
 */
public record ImportSpec(
        String poolName,
        FileFormat format,
        String idColumn,
        List<String> featureColumns,
        List<String> displayColumns,
        String labelColumn,
        List<String> classes,
        List<String> categorical,
        int maxLevels,
        int maxFieldChars,
        long maxBytes,
        String importedBy,
        List<String> missingTokens) {

    public static final int DEFAULT_MAX_LEVELS = 50;
    public static final int DEFAULT_MAX_FIELD_CHARS = 100_000;
    public static final long UNLIMITED_BYTES = Long.MAX_VALUE;
    /** Most classes a label set may have; keys run out after 35, later classes are clicked. */
    public static final int MAX_CLASSES = 200;
    public static final int MAX_KEY_CHARS = 200;
    /**
     * What files commonly write for a missing value: R and many exports (NA, N/A), pandas and
     * spreadsheets (NaN, NULL, null), and the UCI repository (?). Matched whole, after trimming.
     */
    public static final List<String> DEFAULT_MISSING_TOKENS = List.of("NA", "N/A", "NaN", "?", "null", "NULL");

    /** A spec whose missing tokens are the defaults. */
    public ImportSpec(String poolName, FileFormat format, String idColumn, List<String> featureColumns,
                      List<String> displayColumns, String labelColumn, List<String> classes, List<String> categorical,
                      int maxLevels, int maxFieldChars, long maxBytes, String importedBy) {
        this(poolName, format, idColumn, featureColumns, displayColumns, labelColumn, classes, categorical, maxLevels,
                maxFieldChars, maxBytes, importedBy, DEFAULT_MISSING_TOKENS);
    }

    public ImportSpec {
        PoolWriter.checkName(poolName);
        if (format == null) {
            throw new IllegalArgumentException("format is required: csv or jsonl");
        }
        featureColumns = featureColumns == null ? List.of() : List.copyOf(featureColumns);
        displayColumns = displayColumns == null ? List.of() : List.copyOf(displayColumns);
        classes = classes == null ? List.of() : List.copyOf(classes);
        categorical = categorical == null ? List.of() : List.copyOf(categorical);
        if (maxLevels < 2) {
            throw new IllegalArgumentException("the most categories of a feature (max_levels; --max-levels on the command line) must be at least 2,"
                    + " got " + maxLevels);
        }
        if (maxFieldChars < 16) {
            throw new IllegalArgumentException("the longest field (max_field_chars; --max-field-chars on the command line) must be at least 16"
                    + " characters, got " + maxFieldChars);
        }
        if (maxBytes < 1) {
            throw new IllegalArgumentException("maxBytes is " + maxBytes + "; it must be positive");
        }
        if (classes.size() > MAX_CLASSES) {
            throw new IllegalArgumentException("at most " + MAX_CLASSES + " classes are allowed, got " + classes.size());
        }
        if (classes.stream().distinct().count() != classes.size()) {
            throw new IllegalArgumentException("the classes " + classes + " name one class twice");
        }
        for (String c : classes) {
            if (c.isBlank() || c.length() > MAX_KEY_CHARS) {
                throw new IllegalArgumentException("class '" + c + "' must be 1 to " + MAX_KEY_CHARS + " characters");
            }
        }
        if (importedBy == null || importedBy.isBlank()) {
            throw new IllegalArgumentException("importedBy is required");
        }
        missingTokens = missingTokens == null ? List.of() : missingTokens.stream().map(String::strip).toList();
    }

    /** A spec with every default: id from line numbers, no labels, all columns as features. */
    public static ImportSpec defaults(String poolName, FileFormat format) {
        return new ImportSpec(poolName, format, null, null, null, null, null, null, DEFAULT_MAX_LEVELS,
                DEFAULT_MAX_FIELD_CHARS, UNLIMITED_BYTES, "import");
    }

    /**
     * Whether the spec gives people classes to choose from: a label set, or a column of labels to
     * take them from. A pool made for labelling needs one; the commands that fit a file do not.
     */
    public boolean namesLabelSet() {
        return labelColumn != null || !classes.isEmpty();
    }

    public ImportSpec withId(String column) {
        return new ImportSpec(poolName, format, column, featureColumns, displayColumns, labelColumn, classes,
                categorical, maxLevels, maxFieldChars, maxBytes, importedBy, missingTokens);
    }

    public ImportSpec withLabel(String column) {
        return new ImportSpec(poolName, format, idColumn, featureColumns, displayColumns, column, classes,
                categorical, maxLevels, maxFieldChars, maxBytes, importedBy, missingTokens);
    }

    public ImportSpec withClasses(List<String> labelSet) {
        return new ImportSpec(poolName, format, idColumn, featureColumns, displayColumns, labelColumn, labelSet,
                categorical, maxLevels, maxFieldChars, maxBytes, importedBy, missingTokens);
    }

    public ImportSpec withFeatures(List<String> columns) {
        return new ImportSpec(poolName, format, idColumn, columns, displayColumns, labelColumn, classes,
                categorical, maxLevels, maxFieldChars, maxBytes, importedBy, missingTokens);
    }

    public ImportSpec withDisplay(List<String> columns) {
        return new ImportSpec(poolName, format, idColumn, featureColumns, columns, labelColumn, classes,
                categorical, maxLevels, maxFieldChars, maxBytes, importedBy, missingTokens);
    }

    public ImportSpec withLimits(int levels, int fieldChars, long bytes) {
        return new ImportSpec(poolName, format, idColumn, featureColumns, displayColumns, labelColumn, classes,
                categorical, levels, fieldChars, bytes, importedBy, missingTokens);
    }

    public ImportSpec withMissingTokens(List<String> tokens) {
        return new ImportSpec(poolName, format, idColumn, featureColumns, displayColumns, labelColumn, classes,
                categorical, maxLevels, maxFieldChars, maxBytes, importedBy, tokens);
    }
}
