package dev.dowser.demo;

import dev.dowser.data.FileFormat;
import dev.dowser.data.ImportResult;
import dev.dowser.data.ImportSpec;
import dev.dowser.data.ImportProgress;
import dev.dowser.data.Importer;
import dev.dowser.store.Database;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

/**
 * Loads the demo pool: writes the Kettlewater Works readings to a CSV in the data folder (truth
 * included, for trying the offline commands) and imports them through the ordinary importer,
 * without the truth column, so the pool starts unlabelled with the five conditions as its label set.
 */
public final class DemoPool {

    public static final String POOL = "kettlewater-pumps";
    public static final String FILE = "kettlewater-pumps.csv";
    public static final int DEFAULT_RECORDS = 3_000;
    public static final long DEFAULT_SEED = 7;

    private DemoPool() {
    }

    public static ImportResult load(Database db, Path dataDir, int records, long seed) {
        return store(db, write(dataDir, records, seed), ImportProgress.NONE);
    }

    /** Writes the readings, truth included, to the demo's CSV in {@code dataDir}; returns the file. */
    public static Path write(Path dataDir, int records, long seed) {
        Path csv = dataDir.resolve(FILE);
        try (Writer w = Files.newBufferedWriter(csv, StandardCharsets.UTF_8)) {
            PumpTraces.write(w, records, seed);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write the demo file " + csv + ": " + e.getMessage(), e);
        }
        return csv;
    }

    /** Imports the demo's CSV as the demo pool, without its truth, telling {@code progress} how far it has come. */
    public static ImportResult store(Database db, Path csv, ImportProgress progress) {
        ImportSpec spec = ImportSpec.defaults(POOL, FileFormat.CSV)
                .withId("reading")
                .withFeatures(PumpTraces.FEATURES)
                .withDisplay(PumpTraces.DISPLAY)
                .withClasses(PumpTraces.CONDITIONS);
        try (InputStream in = Files.newInputStream(csv)) {
            return new Importer(db).run(in, FILE, spec, progress);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read the demo file " + csv + ": " + e.getMessage(), e);
        }
    }
}
