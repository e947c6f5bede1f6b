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
 * The short version of the honest-accuracy check (the long one, digits with 10 seeds, is a
 * documented run of {@code simulate}): on the Wisconsin breast cancer data (569 x 30, 2 classes,
 * as shipped by Debian's python3-sklearn), power sampling, 3 seeds, the accuracy the app
 * estimates from its labels by LURE (Farquhar et al. 2021) holds the held-out test accuracy
 * within its 95% interval in at least 90% of rounds.
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
}
