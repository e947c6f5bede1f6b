package dev.dowser.cli;

import dev.dowser.data.FileFormat;
import dev.dowser.data.ImportProgress;
import dev.dowser.data.ImportResult;
import dev.dowser.data.ImportSpec;
import dev.dowser.data.Importer;
import dev.dowser.store.Database;
import java.io.IOException;
import java.io.InputStream;
import java.io.PrintWriter;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.util.SplittableRandom;

/**
 * The import's cost against the column count: the same number of fields in files of 64, 2,000,
 * 10,000 and 20,000 columns (fewer rows as the columns grow). Linear in the column count means the same fields
 * per second for each; the ratios to 64 columns are printed from the same run.
 */
final class WideImportBench {

    static final int[] COLUMNS = {64, 2_000, 10_000, 20_000};

    private WideImportBench() {
    }

    static void run(PrintWriter out, Path dir, boolean quick) throws IOException {
        long fields = quick ? 2_000_000 : 8_000_000;
        double narrow = Double.NaN;
        for (int cols : COLUMNS) {
            int rows = (int) Math.max(1, fields / cols);
            Path csv = dir.resolve("wide-" + cols + ".csv");
            write(csv, cols, rows);
            try (Database db = Database.open(dir.resolve("db-wide-" + cols), Clock.systemUTC());
                 InputStream in = Files.newInputStream(csv)) {
                ImportResult r = new Importer(db).run(in, csv.getFileName().toString(),
                        ImportSpec.defaults("wide", FileFormat.CSV).withId("id").withClasses(java.util.List.of("a", "b")),
                        ImportProgress.NONE);
                double perSecond = (double) r.records() * cols / r.seconds();
                if (cols == COLUMNS[0]) {
                    narrow = perSecond;
                }
                out.printf("import_wide_%d_columns_rows=%d%nimport_wide_%d_columns_seconds=%.2f%n"
                                + "import_wide_%d_columns_fields_per_s=%.0f%nimport_wide_%d_columns_to_64_speed=%.2f%n",
                        cols, r.records(), cols, r.seconds(), cols, perSecond, cols, perSecond / narrow);
                out.flush();
            }
            Files.delete(csv);
        }
    }

    /** An id, then {@code cols} Gaussian numbers with three decimals, {@code rows} times. */
    private static void write(Path file, int cols, int rows) throws IOException {
        SplittableRandom rng = new SplittableRandom(BenchCommand.SEED);
        try (Writer w = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
            StringBuilder line = new StringBuilder(cols * 8).append("id");
            for (int c = 0; c < cols; c++) {
                line.append(",c").append(c);
            }
            w.write(line.append('\n').toString());
            for (int r = 0; r < rows; r++) {
                line.setLength(0);
                line.append('r').append(r);
                for (int c = 0; c < cols; c++) {
                    line.append(',');
                    BenchCommand.appendFixed4(line, rng.nextGaussian());
                }
                w.write(line.append('\n').toString());
            }
        }
    }
}
