package dev.dowser.simulate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Strategy;
import dev.dowser.stats.Bootstrap;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code bench --only labels --random-from}: random's curves read from an earlier run instead of
 * run again. It rests on a random curve depending only on its seed, which the first test checks on
 * Fisher's iris (sklearn's copy): random run alone to a smaller budget draws the same points as
 * random run beside power to a larger one.
 */
class RandomFromTest {

    private static final LabelSavings.Setup IRIS = LabelSavings.setup("iris");

    private static LabelSavings.Result run(List<Strategy> strategies, int budget, Path randomFrom, Path out)
            throws IOException {
        return LabelSavings.run(IRIS.withBudget(budget), TestSupport.datasetsDir(), strategies, 2,
                TestSupport.quickSampler(), PoolSettings.defaults(), randomFrom, out,
                new PrintWriter(new StringWriter()), k -> { });
    }

    /** Each point as "seed,labels,accuracy,nll,ece", exactly. */
    private static List<String> rows(List<Simulation.Point> points, Strategy s, int upTo) {
        return rows(points, s, upTo, "%s,%s,%s");
    }

    /** As curves.csv keeps them: to 5 decimals. */
    private static List<String> csvRows(List<Simulation.Point> points, Strategy s, int upTo) {
        return rows(points, s, upTo, "%.5f,%.5f,%.5f");
    }

    private static List<String> rows(List<Simulation.Point> points, Strategy s, int upTo, String format) {
        List<String> out = new ArrayList<>();
        for (Simulation.Point p : points) {
            if (p.strategy() == s && p.labels() <= upTo) {
                out.add(p.seed() + "," + p.labels() + "," + String.format(Locale.ROOT, format, p.accuracy(), p.nll(),
                        p.ece()));
            }
        }
        return out;
    }

    @Test
    void randomIsReadNotRunAndItsLongerCurveGivesTheSavings(@TempDir Path dir) throws IOException {
        LabelSavings.Result full = run(List.of(Strategy.POWER), 30, null, dir.resolve("full"));
        // Random alone to 18 labels draws what random beside power drew to 30: its curve is its seed's alone.
        LabelSavings.Result alone = run(List.of(Strategy.RANDOM), 18, null, dir.resolve("alone"));
        assertEquals(rows(full.points(), Strategy.RANDOM, 18), rows(alone.points(), Strategy.RANDOM, 18));
        assertEquals(6, rows(alone.points(), Strategy.RANDOM, 18).size(), "2 seeds at 6, 12 and 18 labels");

        LabelSavings.Result early = run(List.of(Strategy.POWER), 18, dir.resolve("full"), dir.resolve("early"));
        assertEquals(rows(full.points(), Strategy.POWER, 18), rows(early.points(), Strategy.POWER, 18));
        // random's points are the earlier run's, as its curves.csv keeps them, to 18 labels in the curves and
        // to 30 in the baseline.
        assertEquals(csvRows(full.points(), Strategy.RANDOM, 18), csvRows(early.points(), Strategy.RANDOM, 18));
        assertEquals(csvRows(full.points(), Strategy.RANDOM, 30), csvRows(early.baseline(), Strategy.RANDOM, 30));
        String summary = Files.readString(dir.resolve("early").resolve("iris").resolve("summary.txt"));
        assertTrue(summary.startsWith("random: not run again; its curves come from "
                + dir.resolve("full").resolve("iris").resolve("curves.csv")), summary);
        assertTrue(summary.contains("labels_to_0.9_random_to_30="), summary);
        assertTrue(summary.contains("savings_0.9_power_against_random_to_30"), summary);
        assertTrue(LabelSavings.table(List.of(early), Strategy.POWER).contains("(run to 30)"));
    }

    @Test
    void anEarlierRunThatDoesNotCoverTheBudgetOrRandomNamedTooIsRefused(@TempDir Path dir) throws IOException {
        run(List.of(Strategy.RANDOM), 12, null, dir.resolve("short"));
        IllegalArgumentException shorter = assertThrows(IllegalArgumentException.class,
                () -> run(List.of(Strategy.POWER), 18, dir.resolve("short"), dir.resolve("out")));
        assertEquals(dir.resolve("short").resolve("iris").resolve("curves.csv") + " has no random point at 18 labels"
                + " on seed 0: it must come from a run with the same first batch (6), batch (6), these seeds and a"
                + " budget of at least 18", shorter.getMessage());
        IllegalArgumentException both = assertThrows(IllegalArgumentException.class,
                () -> run(List.of(Strategy.POWER, Strategy.RANDOM), 12, dir.resolve("short"), dir.resolve("out")));
        assertEquals("random's curves come from " + dir.resolve("short") + ": leave random out of the strategies",
                both.getMessage());
        IllegalArgumentException none = assertThrows(IllegalArgumentException.class,
                () -> run(List.of(Strategy.POWER), 12, dir.resolve("nothing"), dir.resolve("out")));
        assertEquals("no curves from an earlier run at " + dir.resolve("nothing").resolve("iris").resolve("curves.csv"),
                none.getMessage());
    }

    /** Curves made by hand: the strategy stops at 60 labels, random's earlier run went on to 100. */
    @Test
    void theSavingsAgainstALongerBaselinePairTheSeeds() {
        List<Simulation.Point> strategy = new ArrayList<>();
        List<Simulation.Point> random = new ArrayList<>();
        for (int seed = 0; seed < 3; seed++) {
            for (int labels = 20; labels <= 100; labels += 20) {
                // The strategy reaches 0.8 at 40 labels on every seed; random at 80.
                if (labels <= 60) {
                    strategy.add(new Simulation.Point(Strategy.POWER, seed, labels, labels >= 40 ? 0.8 : 0.5, 0, 0, 0));
                }
                random.add(new Simulation.Point(Strategy.RANDOM, seed, labels, labels >= 80 ? 0.8 : 0.5, 0, 0, 0));
            }
        }
        List<Simulation.Point> both = new ArrayList<>(strategy);
        random.stream().filter(p -> p.labels() <= 60).forEach(both::add);
        LearningCurves lc = LearningCurves.of(both, List.of(Strategy.POWER, Strategy.RANDOM), 3);
        LearningCurves full = LearningCurves.of(random, List.of(Strategy.RANDOM), 3);
        // Within 60 labels random never reaches 0.8 (an infinite ratio); its whole curve says 80 / 40.
        assertTrue(Double.isInfinite(lc.savingsRatio(Strategy.POWER, Strategy.RANDOM, 0.8)));
        assertEquals(2.0, lc.savingsRatio(Strategy.POWER, full, Strategy.RANDOM, 0.8), 1e-12);
        Bootstrap.Interval ci = lc.savingsRatioInterval(Strategy.POWER, full, Strategy.RANDOM, 0.8);
        assertEquals(2.0, ci.lower(), 1e-12);
        assertEquals(2.0, ci.upper(), 1e-12);
        IllegalArgumentException fewer = assertThrows(IllegalArgumentException.class, () -> lc.savingsRatioInterval(
                Strategy.POWER, LearningCurves.of(random, List.of(Strategy.RANDOM), 2), Strategy.RANDOM, 0.8));
        assertEquals("the baseline has 2 seeds, these curves 3: pair them on the same seeds", fewer.getMessage());
    }
}
