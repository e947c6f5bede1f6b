package dev.dowser.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * The stopping rule of Bloodgood & Vijay-Shanker (2009): Cohen's kappa between successive rounds'
 * predictions on a fixed stop set, and a stop once the mean of the last three reaches 0.99.
 */
class StabilisingPredictionsTest {

    @Test
    void agreementIsCohensKappaOnTheStopSet() {
        // 2,000 stop-set records over 10 classes, 200 predicted in each; the next round moves 10
        // records to the next class. p_o = 1990/2000 = 0.995; the margins stay 200 each, so
        // p_e = 10 * 0.1^2 = 0.1 and kappa = (0.995 - 0.1) / 0.9 = 0.99444 (Cohen 1960).
        int[] before = new int[2000];
        int[] after = new int[2000];
        for (int i = 0; i < 2000; i++) {
            before[i] = i % 10;
            after[i] = before[i];
        }
        for (int k = 0; k < 10; k++) {
            after[k * 200 + k] = (k + 1) % 10;
        }
        assertEquals((0.995 - 0.1) / 0.9, StabilisingPredictions.agreement(before, after, 10), 1e-12);
        assertEquals(1, StabilisingPredictions.agreement(before, before, 10), 1e-12);
    }

    @Test
    void stopsWhenTheMeanOfTheLastThreeReaches099() {
        StabilisingPredictions rule = StabilisingPredictions.published();
        assertEquals(3, rule.window());
        assertEquals(0.99, rule.threshold());
        // 0.97, 0.99, 0.995 average 0.985: not yet; with 0.99 next the last three average 0.99167.
        List<Double> kappas = List.of(0.5, 0.97, 0.99, 0.995, 0.99);
        assertFalse(rule.stable(kappas.subList(0, 4)));
        assertTrue(rule.stable(kappas));
        assertEquals(4, rule.firstStable(kappas));
        // One perfect round among weaker ones is not enough: (0.96 + 1 + 1) / 3 = 0.9867.
        assertFalse(rule.stable(List.of(0.96, 1.0, 1.0)));
        assertEquals(-1, rule.firstStable(List.of(0.96, 1.0, 1.0)));
        // Fewer than three comparisons never stop, nor does an undefined kappa.
        assertFalse(rule.stable(List.of(1.0, 1.0)));
        assertFalse(rule.stable(List.of(Double.NaN, 1.0, 1.0)));
        assertTrue(Double.isNaN(rule.recentMean(List.of(1.0))));
    }

    @Test
    void aLowerThresholdIsTheUsersChoice() {
        StabilisingPredictions lenient = new StabilisingPredictions(3, 0.95);
        assertTrue(lenient.stable(List.of(0.96, 0.95, 0.97)));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> new StabilisingPredictions(3, 1.5));
        assertEquals("the kappa threshold must lie in (0, 1], got 1.5", e.getMessage());
    }

    @Test
    void theStopSetIsAUniformSampleThatNeverChanges() {
        // Every row of a pool of 10 is in a set of 3 with probability 3/10: over 30,000 sets each
        // count has sd sqrt(30000 * 0.3 * 0.7) = 79; a chi-square with 9 degrees of freedom
        // stays under 27.88 (its 0.1% point, any table).
        SplittableRandom rng = new SplittableRandom(41);
        int trials = 30_000;
        long[] count = new long[10];
        for (int t = 0; t < trials; t++) {
            long[] set = StabilisingPredictions.stopSet(10, 3, rng);
            assertEquals(3, set.length);
            assertTrue(set[0] < set[1] && set[1] < set[2], java.util.Arrays.toString(set));
            for (long r : set) {
                count[(int) r]++;
            }
        }
        double expected = trials * 0.3;
        double chi2 = 0;
        for (long c : count) {
            chi2 += (c - expected) * (c - expected) / expected;
        }
        assertTrue(chi2 < 27.88, "chi-square " + chi2);
        // The same seed gives the same set; a small pool is taken whole.
        assertEquals(java.util.Arrays.toString(StabilisingPredictions.stopSet(1_000_000, 2000, new SplittableRandom(5))),
                java.util.Arrays.toString(StabilisingPredictions.stopSet(1_000_000, 2000, new SplittableRandom(5))));
        assertEquals("[0, 1, 2, 3]", java.util.Arrays.toString(StabilisingPredictions.stopSet(4, 2000, rng)));
    }
}
