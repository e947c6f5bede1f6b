package dev.dowser.cli;

import dev.dowser.data.ImportResult;
import dev.dowser.data.ImportSpec;
import dev.dowser.data.Importer;
import dev.dowser.store.Database;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
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

    @Mixin
    ColumnOptions columns;

    @Override
    public Integer call() {
        ImportSpec spec = columns.spec(pool, "import");
        Path file = columns.file;
        if (!spec.namesLabelSet()) {
            throw new IllegalArgumentException("a pool needs classes for people to choose from: name them with"
                    + " --classes a,b,c, or name the column that holds labels already given with --label COL");
        }
        columns.checkFile();
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
