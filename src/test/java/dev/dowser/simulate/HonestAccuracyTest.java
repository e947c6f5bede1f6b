package dev.dowser.simulate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.data.LabelledSet;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Strategy;
import dev.dowser.sampler.SamplerConfig;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The short versions of issue 12's proof (the long one, digits with 10 seeds up to 600 labels, is
 * {@code dowser bench --only stopping}), on the Wisconsin breast cancer data (569 x 30, 2 classes,
 * as shipped by Debian's python3-sklearn) with power sampling: the accuracy the app estimates from
 * its labels by LURE (Farquhar et al. 2021) holds the held-out test accuracy within its 95%
 * interval in at least 90% of rounds; and with the app's own sampler and pool settings the
 * stopping rule (stabilising predictions, Bloodgood & Vijay-Shanker 2009) fires in every seed
 * before the budget, at a test accuracy within a point of the budget's.
 */
class HonestAccuracyTest {

    @TempDir
    Path dir;

    @Test
    void theEstimateHoldsTheTestAccuracyInNineRoundsOfTen() {
        LabelledSet all = TestSupport.labelledOpenDataset("breast_cancer", dir);
        SamplerConfig sampler = SamplerConfig.builder().hidden(List.of(32)).chains(4, 32).burnInSteps(300)
                .reburnInSteps(100).thinSteps(5).build();
        Simulation.Plan plan = new Simulation.Plan(List.of(Strategy.POWER), 3, 20, 150, 0.3, PoolSettings.defaults(),
                sampler, 7);
        List<Simulation.Point> points = Simulation.run(all, plan, k -> { });
        List<StopSummary.Seed> seeds = StopSummary.seeds(points, plan.strategies(), plan.seeds());
        StringWriter out = new StringWriter();
        StopSummary.print(new PrintWriter(out), seeds, plan.strategies());
        System.out.println("Honest accuracy on breast cancer, power sampling, 3 seeds:\n" + out);
        int covered = seeds.stream().mapToInt(StopSummary.Seed::covered).sum();
        int estimated = seeds.stream().mapToInt(StopSummary.Seed::estimated).sum();
        assertEquals(3 * 13, estimated, "every round but the last of each seed has an estimate\n" + out);
        assertTrue(covered >= 0.9 * estimated, covered + " of " + estimated + " rounds covered\n" + out);
    }

    @Test
    void theStopFiresWithinAPointOfTheBudgetsAccuracy() {
        LabelledSet all = TestSupport.labelledOpenDataset("breast_cancer", dir);
        int budget = 250;
        Simulation.Plan plan = new Simulation.Plan(List.of(PoolSettings.DEFAULT_STRATEGY), 3, 10, budget, 0.3,
                PoolSettings.defaults(), SamplerConfig.defaults(), 7);
        List<Simulation.Point> points = Simulation.run(all, plan, k -> { });
        List<StopSummary.Seed> seeds = StopSummary.seeds(points, plan.strategies(), plan.seeds());
        StringWriter out = new StringWriter();
        StopSummary.print(new PrintWriter(out), seeds, plan.strategies());
        System.out.println("Stopping on breast cancer, the app's defaults, 3 seeds:\n" + out);
        for (StopSummary.Seed s : seeds) {
            assertTrue(s.stopAt() > 0 && s.stopAt() < budget, "seed " + s.seed() + " never stopped before " + budget
                    + "\n" + out);
        }
        StopSummary.Verdict v = StopSummary.verdict(seeds, PoolSettings.DEFAULT_STRATEGY, StopSummary.BOOTSTRAP_SEED);
        assertTrue(v.gapPoints() <= StopSummary.GAP_POINTS, v + "\n" + out);
    }
}
