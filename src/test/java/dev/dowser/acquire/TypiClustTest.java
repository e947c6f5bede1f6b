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
}
