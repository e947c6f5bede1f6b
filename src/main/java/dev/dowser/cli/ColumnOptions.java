package dev.dowser.cli;

import dev.dowser.data.FileFormat;
import dev.dowser.data.ImportSpec;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import picocli.CommandLine.Option;

/**
 * A file and how its columns are used and encoded: the options {@code import}, {@code fit} and
 * {@code simulate} share, under the same names, so a file reads the same way in each.
 */
final class ColumnOptions {

    @Option(names = {"--file", "--csv"}, required = true, paramLabel = "F",
            description = "The file: CSV or JSON Lines.")
    Path file;

    @Option(names = "--format", paramLabel = "csv|jsonl",
            description = "File format (default: from the file name; .jsonl, .ndjson and .json mean JSON Lines).")
    String format;

    @Option(names = "--id", paramLabel = "COL", description = "Column of record ids (default: the line number).")
    String id;

    @Option(names = "--features", split = ",", paramLabel = "COL",
            description = "Columns the model sees (default: every column but the id and label).")
    List<String> features;

    @Option(names = "--display", split = ",", paramLabel = "COL",
            description = "Columns a person sees (default: every column but the id and label).")
    List<String> display;

    @Option(names = "--label", paramLabel = "COL", description = "Column of labels already given.")
    String label;

    @Option(names = "--classes", split = ",", paramLabel = "CLASS",
            description = "The label set, in key order (default: the values seen in the label column).")
    List<String> classes;

    @Option(names = "--categorical", split = ",", paramLabel = "COL",
            description = "Feature columns to one-hot encode even if their values look like numbers.")
    List<String> categorical;

    @Option(names = "--max-levels", paramLabel = "N", defaultValue = "" + ImportSpec.DEFAULT_MAX_LEVELS,
            description = "Most distinct values of a categorical feature (default: ${DEFAULT-VALUE}).")
    int maxLevels;

    @Option(names = "--max-field-chars", paramLabel = "N", defaultValue = "" + ImportSpec.DEFAULT_MAX_FIELD_CHARS,
            description = "Longest field accepted, in characters (default: ${DEFAULT-VALUE}).")
    int maxFieldChars;

    @Option(names = "--missing", split = ",", paramLabel = "TOKEN",
            description = "Values that mean missing, beside an empty field: a feature column gets a missing-value"
                    + " indicator, not a category (default: NA,N/A,NaN,?,null,NULL; --missing= for none).")
    List<String> missing;

    /** How to read the file, for a pool (or a throwaway name) called {@code pool}. */
    ImportSpec spec(String pool, String importedBy) {
        FileFormat fileFormat = format == null ? FileFormat.fromFileName(file.toString()) : FileFormat.parse(format);
        return new ImportSpec(pool, fileFormat, id, features, display, label, classes, categorical, maxLevels,
                maxFieldChars, ImportSpec.UNLIMITED_BYTES, importedBy,
                missing == null ? ImportSpec.DEFAULT_MISSING_TOKENS
                        : missing.stream().filter(t -> !t.isBlank()).toList());
    }

    /** Fails with a message naming the file unless it is a readable file. */
    void checkFile() {
        if (!Files.isRegularFile(file)) {
            throw new IllegalArgumentException(Files.exists(file) ? file + " is not a file" : "there is no file " + file);
        }
    }
}
