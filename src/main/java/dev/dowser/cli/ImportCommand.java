package dev.dowser.cli;

import dev.dowser.data.FileFormat;
import dev.dowser.data.ImportResult;
import dev.dowser.data.ImportSpec;
import dev.dowser.data.Importer;
import dev.dowser.store.Database;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

@Command(name = "import", mixinStandardHelpOptions = true,
        description = {"Creates a pool from a CSV or JSON Lines file.",
            "All or nothing: a bad line stops the import with its line and column named, and the database"
                + " stays exactly as it was."})
final class ImportCommand implements Callable<Integer> {

    @Spec
    CommandSpec command;

    @Mixin
    DataOption data;

    @Option(names = "--pool", required = true, paramLabel = "NAME", description = "Name of the new pool.")
    String pool;

    @Option(names = "--file", required = true, paramLabel = "F", description = "The file to import.")
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

    @Option(names = "--label", paramLabel = "COL", description = "Column of labels already given, if any.")
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

    @Override
    public Integer call() {
        FileFormat fileFormat = format == null ? FileFormat.fromFileName(file.toString()) : FileFormat.parse(format);
        ImportSpec spec = new ImportSpec(pool, fileFormat, id, features, display, label, classes, categorical,
                maxLevels, maxFieldChars, ImportSpec.UNLIMITED_BYTES, "import");
        if (!spec.namesLabelSet()) {
            throw new IllegalArgumentException("a pool needs classes for people to choose from: name them with"
                    + " --classes a,b,c, or name the column that holds labels already given with --label COL");
        }
        if (!Files.isRegularFile(file)) {
            throw new IllegalArgumentException(Files.exists(file) ? file + " is not a file"
                    : "there is no file " + file);
        }
        long size;
        try {
            size = Files.size(file);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read " + file + ": " + e.getMessage(), e);
        }
        ProgressBar bar = new ProgressBar(System.err, "records");
        try (Database db = data.open(); InputStream in = Files.newInputStream(file)) {
            ImportResult r = new Importer(db).run(in, file.getFileName().toString(), spec,
                    (rows, bytes) -> bar.show(bytes, size, rows));
            command.commandLine().getOut().printf("pool=%s%nrecords=%d%nlabelled=%d%nclasses=%s%nfeatures=%d%nseconds=%.2f%n"
                            + "records_per_s=%.0f%n", r.poolName(), r.records(), r.labelled(),
                    String.join(",", r.classes()), r.features(), r.seconds(), r.recordsPerSecond());
            return 0;
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read " + file + ": " + e.getMessage(), e);
        } finally {
            bar.finish();
        }
    }
}
