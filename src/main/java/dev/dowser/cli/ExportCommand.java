package dev.dowser.cli;

import dev.dowser.data.Exporter;
import dev.dowser.data.FileFormat;
import dev.dowser.json.Json;
import dev.dowser.store.Database;
import java.io.IOException;
import java.io.OutputStream;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

@Command(name = "export", mixinStandardHelpOptions = true,
        description = {"Writes a pool's labelled records with who labelled them and when."})
final class ExportCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    @Mixin
    DataOption data;

    @Option(names = "--pool", required = true, paramLabel = "NAME", description = "The pool to export.")
    String pool;

    @Option(names = "--format", defaultValue = "csv", paramLabel = "csv|jsonl",
            description = "Output format (default: ${DEFAULT-VALUE}).")
    String format;

    @Option(names = "--out", paramLabel = "F", description = "Output file (default: standard output); F.meta.json beside it holds the classes with their keys and what each field means.")
    Path out;

    @Option(names = "--formulas", defaultValue = "escape", paramLabel = "escape|keep",
            description = "CSV fields a spreadsheet would run as formulas (starting with = + - @, a tab or a carriage"
                    + " return, and not a plain number): escape writes them with a ' in front, keep writes them"
                    + " as they are (default: ${DEFAULT-VALUE}).")
    String formulas;

    @Override
    public Integer call() {
        FileFormat fileFormat = FileFormat.parse(format);
        Exporter.Formulas guard = Exporter.Formulas.parse(formulas);
        try (Database db = data.open()) {
            long n;
            if (out == null) {
                n = new Exporter(db).export(pool, fileFormat, guard, System.out);
            } else {
                try (OutputStream o = Files.newOutputStream(out)) {
                    n = new Exporter(db).export(pool, fileFormat, guard, o);
                }
                Path meta = out.resolveSibling(out.getFileName() + ".meta.json");
                Files.writeString(meta, Json.write(new Exporter(db).metadata(pool)) + "\n");
                spec.commandLine().getErr().printf("exported=%d%nfile=%s%nmetadata=%s%n", n, out, meta);
            }
            return 0;
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + out + ": " + e.getMessage(), e);
        }
    }
}
