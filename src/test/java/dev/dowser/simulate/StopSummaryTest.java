package dev.dowser.simulate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.rounds.Strategy;
import dev.dowser.stats.AccuracyEstimate;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/** What simulate says about stopping, from curves made to order. */
class StopSummaryTest {

    /** A run whose test accuracy is {@code acc[i]} at 10 (i + 1) labels, settled from {@code settledAt} labels on. */
    private static List<Simulation.Point> run(int seed, double[] acc, int settledAt) {
        List<Simulation.Point> out = new ArrayList<>();
        for (int i = 0; i < acc.length; i++) {
            int labels = 10 * (i + 1);
            AccuracyEstimate e = i == acc.length - 1 ? null : new AccuracyEstimate(acc[i], acc[i] - 0.05,
                    acc[i] + (i == 0 ? -0.01 : 0.05), 10, 10);
            out.add(new Simulation.Point(Strategy.POWER, seed, labels, acc[i], 0, 0, 0, 0.99, settledAt > 0
                    && labels >= settledAt, e));
        }
        return out;
    }

    @Test
    void stopsBesideThePlateauAndMediansOverSeeds() {
        double[] acc = {0.70, 0.85, 0.90, 0.93, 0.935, 0.94, 0.936, 0.94};
        List<Simulation.Point> points = new ArrayList<>();
        points.addAll(run(0, acc, 50));
        points.addAll(run(1, acc, 70));
        points.addAll(run(2, acc, 0));
        List<StopSummary.Seed> seeds = StopSummary.seeds(points, List.of(Strategy.POWER), 3);
        StopSummary.Seed first = seeds.get(0);
        assertEquals(50, first.stopAt());
        // Within a point of 0.94 (the budget's) from 40 labels on: 0.93, 0.935, 0.94, 0.936, 0.94.
        assertEquals(40, first.plateauAt());
        assertEquals(0.935, first.accuracyAtStop(), 1e-12);
        // The first round's interval (0.65 to 0.69) misses 0.70; the rest hold their accuracy; the last has none.
        assertEquals(6, first.covered());
        assertEquals(7, first.estimated());
        assertEquals(-1, seeds.get(2).stopAt());
        assertEquals(0.94, seeds.get(2).accuracyAtStop(), 1e-12, "a seed that never stopped counts at the budget");
        StringWriter w = new StringWriter();
        StopSummary.print(new PrintWriter(w), seeds, List.of(Strategy.POWER));
        String out = w.toString();
        // Stops at 50, 70 and never: the median is 70.
        assertTrue(out.contains("stop_at_power=70\n"), out);
        assertTrue(out.contains("accuracy_at_stop_power=0.936\n"), out);
        assertTrue(out.contains("accuracy_at_budget_power=0.940\n"), out);
        assertTrue(out.contains("estimate_covers_power=0.857\n"), out);
        // Two of three never stopping: none.
        points.addAll(run(3, acc, 0));
        points.addAll(run(4, acc, 0));
        StringWriter none = new StringWriter();
        StopSummary.print(new PrintWriter(none), StopSummary.seeds(points, List.of(Strategy.POWER), 5),
                List.of(Strategy.POWER));
        assertTrue(none.toString().contains("stop_at_power=none\n"), none.toString());
    }

    @Test
    void theVerdictAsksForEverySeedToStopWithinAPointAndAnHonestEstimate() {
        // Accuracy at the budget 0.94; seeds stop at 0.935 (gap 0.5), 0.93 (1.0) and 0.92 (2.0 points).
        double[] acc = {0.70, 0.85, 0.90, 0.92, 0.93, 0.935, 0.94, 0.94};
        List<Simulation.Point> points = new ArrayList<>();
        points.addAll(run(0, acc, 60));
        points.addAll(run(1, acc, 50));
        points.addAll(run(2, acc, 40));
        List<StopSummary.Seed> seeds = StopSummary.seeds(points, List.of(Strategy.POWER), 3);
        StopSummary.Verdict v = StopSummary.verdict(seeds, Strategy.POWER, StopSummary.BOOTSTRAP_SEED);
        assertEquals(3, v.fired());
        assertEquals(1.0, v.gapPoints(), 1e-9, "the median of 0.5, 1.0 and 2.0");
        // Medians of resampled seeds can only be one of the seeds' own gaps.
        assertTrue(v.gapInterval().lower() >= 0.5 - 1e-9 && v.gapInterval().upper() <= 2.0 + 1e-9, v.toString());
        assertEquals(6.0 / 7, v.covers(), 1e-12);
        assertFalse(v.holds(), "the first round's estimate missed: 6 of 7 rounds is under 90%");
        assertTrue(new StopSummary.Verdict(Strategy.POWER, 3, 3, 1.0, v.gapInterval(), 0.9).holds());
        assertFalse(new StopSummary.Verdict(Strategy.POWER, 3, 2, 0.5, v.gapInterval(), 1).holds(),
                "a seed that never stopped");
        assertFalse(new StopSummary.Verdict(Strategy.POWER, 3, 3, 1.1, v.gapInterval(), 1).holds(), "over a point");
        StringWriter w = new StringWriter();
        StopSummary.print(new PrintWriter(w), seeds, List.of(Strategy.POWER));
        assertTrue(w.toString().contains("stop_fired_power=3/3\nstop_gap_power=1.00\nstop_gap_power_interval=0."),
                w.toString());
    }
}
