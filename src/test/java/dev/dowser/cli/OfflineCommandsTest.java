package dev.dowser.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.data.FileFormat;
import dev.dowser.data.ImportException;
import dev.dowser.data.ImportSpec;
import dev.dowser.data.LabelledFiles;
import dev.dowser.data.LabelledSet;
import dev.dowser.demo.PumpTraces;
import java.io.ByteArrayInputStream;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

/**
 * fit and simulate read a file with every option import takes, under the same names, straight into
 * memory: the demo's own CSV (its timestamp column would pass the level limit as a feature), and
 * the tokens files write for a missing value.
 */
class OfflineCommandsTest {

    @TempDir
    Path dir;

    private static String[] run(String... args) {
        CommandLine cl = Main.commandLine();
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        cl.setOut(new PrintWriter(out));
        cl.setErr(new PrintWriter(err));
        int exit = cl.execute(args);
        return new String[] {Integer.toString(exit), out.toString(), err.toString()};
    }

    private Path demoCsv(int records) throws Exception {
        Path csv = dir.resolve("pumps.csv");
        try (Writer w = Files.newBufferedWriter(csv)) {
            PumpTraces.write(w, records, 7);
        }
        return csv;
    }

    /** The demo's file with the gaps files write: '?' for every 17th rpm and 'NA' for every 23rd flow. */
    private Path withGaps(Path csv) throws Exception {
        List<String> lines = Files.readAllLines(csv);
        for (int i = 1; i < lines.size(); i++) {
            // reading,unit,station,recorded_at,rpm,flow_lps,"[trace]",condition: the first six hold no commas.
            String[] f = lines.get(i).split(",", 7);
            f[4] = i % 17 == 0 ? "?" : f[4];
            f[5] = i % 23 == 0 ? "NA" : f[5];
            lines.set(i, String.join(",", f));
        }
        Path gaps = dir.resolve("pumps-with-gaps.csv");
        Files.write(gaps, lines);
        return gaps;
    }

    @Test
    void fitAndSimulateReadTheDemosOwnFile() throws Exception {
        Path csv = withGaps(demoCsv(400));
        String[] plain = run("fit", "--file", csv.toString(), "--label", "condition", "--id", "reading",
                "--draws", "8", "--burn-in", "100", "--thin", "5");
        assertEquals("2", plain[0], "without --features the timestamps are a categorical column");
        assertTrue(plain[2].contains("line 52, column 'recorded_at': more than 50 distinct values"), plain[2]);
        String[] noTokens = run("fit", "--file", csv.toString(), "--label", "condition", "--id", "reading",
                "--features", String.join(",", PumpTraces.FEATURES), "--missing=");
        assertEquals("2", noTokens[0], noTokens[1]);
        assertTrue(noTokens[2].contains("line 18, column 'rpm': expected a number, got '?'"), noTokens[2]);
        String features = String.join(",", PumpTraces.FEATURES);
        String[] fit = run("fit", "--file", csv.toString(), "--label", "condition", "--id", "reading",
                "--features", features, "--draws", "8", "--burn-in", "100", "--thin", "5");
        assertEquals("0", fit[0], fit[2]);
        // 30% of each condition held out, rounded per class: 281 + 119 of the 400 readings.
        assertTrue(fit[1].contains("train_rows=281") && fit[1].contains("test_rows=119"), fit[1]);
        assertFalse(fit[1].contains("NaN") || fit[1].contains("Infinity"), fit[1]);
        String[] sim = run("simulate", "--file", csv.toString(), "--label", "condition", "--id", "reading",
                "--features", features, "--max-levels", "10", "--strategies", "power,random", "--seeds", "2",
                "--seed-labels", "10", "--budget", "30", "--draws", "8", "--burn-in", "50", "--reburn-in", "20",
                "--thin", "2", "--out", dir.resolve("sim").toString());
        assertEquals("0", sim[0], sim[2]);
        assertTrue(sim[1].contains("auc_gain_power="), sim[1]);
        assertFalse(sim[1].contains("NaN"), sim[1]);
        assertTrue(Files.size(dir.resolve("sim").resolve("curves.png")) > 1_000);
    }

    /** NA and ? mean missing: the column stays numeric and gains a missing-value indicator, not a category. */
    @Test
    void missingTokensSetTheIndicator() {
        String csv = "x,y,label\n1,2,a\nNA,3,b\n2,?,a\n4,5,b\n";
        ImportSpec spec = ImportSpec.defaults("f", FileFormat.CSV).withLabel("label");
        LabelledSet set = LabelledFiles.read(new ByteArrayInputStream(csv.getBytes(StandardCharsets.UTF_8)), spec);
        // x and y: one standardised value and one indicator each.
        assertEquals(4, set.cols());
        assertEquals(1f, set.x()[1 * 4 + 1], "row 2's x is missing");
        assertEquals(0f, set.x()[1 * 4], "a missing value takes the mean, 0 once standardised");
        assertEquals(1f, set.x()[2 * 4 + 3], "row 3's y is missing");
        ImportException e = assertThrows(ImportException.class, () -> LabelledFiles.read(new ByteArrayInputStream(
                "x,label\n1,a\n2,b\nNA,a\n".getBytes(StandardCharsets.UTF_8)), spec.withMissingTokens(List.of())));
        assertEquals("line 4, column 'x': expected a number, got 'NA' (the column holds numbers from line 2); if the"
                + " column is categorical, list it among the categorical columns (--categorical)", e.getMessage());
        String[] bad = run("fit", "--file", dir.resolve("absent.csv").toString(), "--label", "y");
        assertEquals("dowser: there is no file " + dir.resolve("absent.csv"), bad[2].strip());
    }
}
