package dev.dowser.acquire;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.HashSet;
import java.util.Set;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * TypiClust after the first batch (Hacohen, Dekel & Weinshall 2022, section 3.2): the next batch
 * goes to the dense regions that hold no label, each pick the most typical record of its region.
 */
class TypiClustTest {

    static final double[][] CENTRES = {{0, 0}, {10, 0}, {0, 10}, {10, 10}};
    static final int PER_BLOB = 200;

    @Test
    void theNextBatchTakesTheCentreOfEachUncoveredBlob() {
        SplittableRandom rng = new SplittableRandom(5);
        double distanceSum = 0;
        int trials = 10;
        for (int trial = 0; trial < trials; trial++) {
            // Four unit Gaussian blobs 10 apart; one label at the centre of each of the first two.
            float[] labelled = {0, 0, 10, 0};
            float[] candidates = new float[4 * PER_BLOB * 2];
            for (int i = 0; i < 4 * PER_BLOB; i++) {
                candidates[2 * i] = (float) (CENTRES[i / PER_BLOB][0] + rng.nextGaussian());
                candidates[2 * i + 1] = (float) (CENTRES[i / PER_BLOB][1] + rng.nextGaussian());
            }
            int[] picked = TypiClust.nextBatch(labelled, 2, candidates, 4 * PER_BLOB, 2, 2, rng);
            assertEquals(2, picked.length);
            Set<Integer> blobs = new HashSet<>();
            for (int c : picked) {
                int blob = c / PER_BLOB;
                blobs.add(blob);
                distanceSum += Math.hypot(candidates[2 * c] - CENTRES[blob][0], candidates[2 * c + 1] - CENTRES[blob][1]);
            }
            assertEquals(Set.of(2, 3), blobs, "one pick from each blob without a label: " + Arrays.toString(picked));
        }
        // A record drawn at random lies sqrt(pi / 2) = 1.25 from its blob's centre on average (Rayleigh's
        // mean); the most typical record of 200 sits far closer.
        assertTrue(distanceSum / (2 * trials) < 0.6, "mean distance from the centre " + distanceSum / (2 * trials));
    }

    @Test
    void aBatchLargerThanTheUncoveredClustersStillPicksDistinctCandidates() {
        SplittableRandom rng = new SplittableRandom(9);
        float[] labelled = new float[] {0, 0};
        float[] candidates = new float[40 * 2];
        for (int i = 0; i < candidates.length; i++) {
            candidates[i] = (float) rng.nextGaussian();
        }
        int[] picked = TypiClust.nextBatch(labelled, 1, candidates, 40, 2, 40, rng);
        assertEquals(40, Arrays.stream(picked).distinct().count(), "every candidate once: " + Arrays.toString(picked));
        assertTrue(Arrays.stream(picked).allMatch(c -> c >= 0 && c < 40));
    }

    @Test
    void theLowBudgetPhaseEndsAtTenLabelsPerClass() {
        assertTrue(TypiClust.lowBudget(99, 10));
        assertFalse(TypiClust.lowBudget(100, 10));
        assertTrue(TypiClust.lowBudget(19, 2));
    }

    @Test
    void aMixedBatchAsksForTheTypicalRecordsTheModelIsUnsureOfAndPowerSamplesTheRest() {
        // Ten candidates; 1 - margin is the gap between the two likeliest classes.
        double[] bald = {0.30, 0.01, 0.20, 0.05, 0.02, 0.40, 0.10, 0.03, 0.08, 0.06};
        double[] gap = {0.05, 0.10, 0.90, 0.20, 0.95, 0.10, 0.60, 0.30, 0.70, 0.99};
        double[] margin = Arrays.stream(gap).map(g -> 1 - g).toArray();
        PoolScorer.Result scores = new PoolScorer.Result(bald, new double[bald.length], margin);
        int[] typical = {2, 4, 1, 3};

        // 1 and 3 are typical and unsure (gap below 0.5), in TypiClust's order, each picked outright; the
        // model is sure of 2 and 4, so power sampling fills the batch from the other eight candidates.
        Picks mixed = TypiClust.mixed(typical, scores, 5, 1.0, new SplittableRandom(4));
        assertEquals(5, mixed.size());
        assertEquals(1, mixed.positions()[0]);
        assertEquals(3, mixed.positions()[1]);
        assertEquals(1.0, mixed.probabilities()[0]);
        assertEquals(1.0, mixed.probabilities()[1]);
        assertEquals(5, Arrays.stream(mixed.positions()).distinct().count(), Arrays.toString(mixed.positions()));
        // Power sampling's first pick among the eight left had probability bald_i / (sum of their bald) (Plackett-Luce).
        double left = Arrays.stream(bald).sum() - bald[1] - bald[3];
        assertEquals(bald[mixed.positions()[2]] / left, mixed.probabilities()[2], 1e-12);

        // Sure of every typical record: exactly power sampling's batch, with the same draws.
        double[] sureMargin = new double[bald.length];
        PoolScorer.Result sure = new PoolScorer.Result(bald, new double[bald.length], sureMargin);
        Picks alone = TypiClust.mixed(typical, sure, 3, 1.0, new SplittableRandom(7));
        Picks power = Pickers.power(bald, 3, 1.0, new SplittableRandom(7));
        assertEquals(Arrays.toString(power.positions()), Arrays.toString(alone.positions()));
        assertEquals(Arrays.toString(power.probabilities()), Arrays.toString(alone.probabilities()));

        // Unsure of every typical record and a batch no larger: the batch is TypiClust's.
        PoolScorer.Result unsure = new PoolScorer.Result(bald, new double[bald.length], new double[] {1, 1, 1, 1, 1, 1, 1,
                1, 1, 1});
        Picks all = TypiClust.mixed(typical, unsure, 4, 1.0, new SplittableRandom(7));
        assertEquals(Arrays.toString(typical), Arrays.toString(all.positions()));
    }
}
