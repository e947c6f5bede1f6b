package dev.dowser.simulate;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.acquire.PoolScorer;
import dev.dowser.data.LabelledSet;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.RoundStep;
import dev.dowser.rounds.Strategy;
import dev.dowser.stats.SeedTree;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * A benchmark's candidate sample: each round scores a uniform sample of the unlabelled records
 * (Fashion-MNIST's plan), and a long run leaves its figures after every seed.
 */
class CandidateSampleTest {

    /**
     * Drawing 5 of 20 rows 20,000 times: every draw holds 5 distinct rows in pool order, and each row
     * is drawn Binomial(20,000, 1/4) times, mean 5,000 and standard deviation 61.2; a tolerance of 5
     * standard deviations (306), with a fixed seed.
     */
    @Test
    void theSampleIsUniformWithoutReplacement() {
        int[] rows = new int[20];
        for (int i = 0; i < rows.length; i++) {
            rows[i] = 100 + 3 * i;
        }
        int[] counts = new int[rows.length];
        SplittableRandom rng = new SplittableRandom(15);
        for (int t = 0; t < 20_000; t++) {
            int[] s = Simulation.Labeller.sample(rows, 5, rng);
            assertEquals(5, s.length);
            for (int i = 0; i < s.length; i++) {
                assertTrue(i == 0 || s[i] > s[i - 1], "distinct and in pool order: " + Arrays.toString(s));
                counts[(s[i] - 100) / 3]++;
            }
        }
        double sd = Math.sqrt(20_000 * 0.25 * 0.75);
        for (int c : counts) {
            assertTrue(Math.abs(c - 5_000) <= 5 * sd, Arrays.toString(counts));
        }
        assertArrayEquals(new int[] {100, 103, 106}, Simulation.Labeller.sample(Arrays.copyOf(rows, 3), 3, rng),
                "a sample of every row is every row");
    }

    /**
     * The stopping figures under a candidate sample: Bloodgood & Vijay-Shanker (2009) compare the
     * predictions on a fixed stop set, all of it but the records labelled since. On Fisher's iris the
     * stop set is every record, so with 30 sampled candidates a round after the first with a model
     * compares 100 - labelled records of a 100-row split (rows 50 to 149 of the file, which the
     * labeller names 0 to 99), not only the stop-set records that happen to be in its sample (at
     * most 30, as before).
     */
    @Test
    void theAgreementIsMeasuredOnTheWholeStopSet() {
        LabelledSet iris = TestSupport.labelledOpenDataset("iris", null);
        LabelledSet split = iris.subset(java.util.stream.IntStream.range(50, 150).toArray());
        PoolSettings settings = PoolSettings.defaults().withBatchSize(6);
        try (PoolScorer scorer = PoolScorer.withAllCores()) {
            Simulation.Labeller run = new Simulation.Labeller(split, settings, TestSupport.quickSampler(),
                    SeedTree.of(4), 30);
            for (int round = 1; round <= 4; round++) {
                int labels = run.labelled();
                RoundStep.Result r = run.round(6, scorer);
                if (round == 2) {
                    assertEquals(0, r.settling().compared(), "the first round with a model has nothing to compare with");
                } else if (round > 2) {
                    assertEquals(30, r.settling().candidates());
                    assertEquals(100 - labels, r.settling().compared(), "round " + round + " after " + labels + " labels");
                }
                run.reveal(r);
            }
        }
    }

    /** On Fisher's iris (150 rows): each round scores 30 sampled records; every seed's points reach afterSeed. */
    @Test
    void eachRoundScoresItsSampleAndEachSeedIsReported() {
        LabelledSet iris = TestSupport.labelledOpenDataset("iris", null);
        PoolSettings settings = PoolSettings.defaults().withBatchSize(6);
        try (PoolScorer scorer = PoolScorer.withAllCores()) {
            Simulation.Labeller run = new Simulation.Labeller(iris, settings, TestSupport.quickSampler(),
                    SeedTree.of(3), 30);
            for (int round = 1; round <= 3; round++) {
                RoundStep.Result r = run.round(6, scorer);
                assertEquals(6, r.queue().size());
                if (!r.cold()) {
                    assertEquals(30, r.settling().candidates(), "round " + round + " picks from its sample");
                }
                run.reveal(r);
            }
            assertEquals(18, run.labelled());
        }
        Simulation.Plan plan = new Simulation.Plan(List.of(Strategy.POWER, Strategy.RANDOM), 2, 6, 18, 0.3, settings,
                TestSupport.quickSampler(), 1, 30);
        List<String> reports = new ArrayList<>();
        List<Simulation.Point> all = Simulation.run(iris, null, plan, k -> { },
                (done, points) -> reports.add(done + ":" + points.size()));
        // Rounds with a model: 6, 12 and 18 labels, for 2 strategies: 6 points a seed.
        assertEquals(List.of("1:6", "2:12"), reports);
        assertEquals(12, all.size());
        IllegalArgumentException small = assertThrows(IllegalArgumentException.class, () -> new Simulation.Plan(
                List.of(Strategy.RANDOM), 1, 20, 100, 0.3, settings, TestSupport.quickSampler(), 1, 10));
        assertEquals("a candidate sample of 10 records cannot fill a batch of 20: sample at least that many, or 0"
                + " for every record", small.getMessage());
    }
}
