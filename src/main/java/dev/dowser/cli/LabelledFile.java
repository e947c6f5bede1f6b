package dev.dowser.cli;

import dev.dowser.data.FeatureMatrix;
import dev.dowser.data.FileFormat;
import dev.dowser.data.ImportProgress;
import dev.dowser.data.ImportSpec;
import dev.dowser.data.Importer;
import dev.dowser.data.LabelledSet;
import dev.dowser.store.Database;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import picocli.CommandLine.Option;

/**
 * The labelled file that the offline commands ({@code fit}, {@code simulate}) work on, with its
 * options: read through the ordinary importer into a throwaway database, so it is checked and
 * encoded exactly as a pool would be.
 */
final class LabelledFile {

    static final String POOL = "offline";

    @Option(names = "--csv", required = true, paramLabel = "F", description = "CSV (or JSON Lines) file with labels.")
    Path file;

    @Option(names = "--label", required = true, paramLabel = "COL", description = "The label column.")
    String label;

    @Option(names = "--id", paramLabel = "COL", description = "Id column, left out of the features.")
    String id;

    /** Every labelled record of the file, standardised as the model sees them. */
    LabelledSet read() throws IOException {
        Path work = Files.createTempDirectory("dowser-offline-");
        // A scratch database, deleted below: nothing in it needs to survive a crash.
        try (Database db = Database.open(work, Clock.systemUTC(), Database.Commits.DELAYED)) {
            ImportSpec spec = ImportSpec.defaults(POOL, FileFormat.fromFileName(file.toString())).withLabel(label)
                    .withId(id);
            try (InputStream in = Files.newInputStream(file)) {
                new Importer(db).run(in, file.getFileName().toString(), spec, ImportProgress.NONE);
            }
            return LabelledSet.of(db, POOL, FeatureMatrix.load(db, POOL));
        } finally {
            Folders.deleteTree(work);
        }
    }
}
