package dev.dowser.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** The Wilson interval against Newcombe (1998), "Two-sided confidence intervals for the single proportion", Table I, method 3. */
class WilsonTest {

    private static void check(int x, int n, double lower, double upper) {
        Wilson w = Wilson.of95(x, n);
        assertEquals(lower, w.lower(), 5e-5, x + "/" + n + " lower");
        assertEquals(upper, w.upper(), 5e-5, x + "/" + n + " upper");
    }

    @Test
    void newcombeTableOne() {
        check(81, 263, 0.2553, 0.3662);
        check(15, 148, 0.0624, 0.1605);
        check(0, 20, 0.0, 0.1611);
        check(1, 29, 0.0061, 0.1718);
    }

    @Test
    void anEffectiveSampleSizeGivesTheCountsInterval() {
        // 81 of 263 as a proportion worth 263 trials is the same interval as the counts.
        Wilson w = Wilson.around(81.0 / 263, 263, Wilson.Z95);
        assertEquals(0.2553, w.lower(), 5e-5);
        assertEquals(0.3662, w.upper(), 5e-5);
    }

    @Test
    void trialsForPlusMinusFivePoints() {
        // Cochran (1977), Sampling Techniques, the usual sample size for +-5 points at 95%:
        // n = z^2 p (1 - p) / d^2 = 384.1 at p = 0.5 and 138.3 at p = 0.9 (Wald's interval).
        // Wilson's interval differs from Wald's by terms in z^2 / n, so it lands within 3% of these.
        assertEquals(384.1, Wilson.trialsFor(0.5, 0.05, Wilson.Z95), 0.03 * 384.1);
        assertEquals(138.3, Wilson.trialsFor(0.9, 0.05, Wilson.Z95), 0.03 * 138.3);
        // The fewest: one trial fewer would be wider than +-5 points.
        for (double p : new double[] {0.5, 0.7, 0.9, 0.97, 1.0}) {
            long n = Wilson.trialsFor(p, 0.05, Wilson.Z95);
            assertTrue(Wilson.halfWidth(p, n, Wilson.Z95) <= 0.05, "p " + p);
            assertTrue(Wilson.halfWidth(p, n - 1, Wilson.Z95) > 0.05, "p " + p);
        }
    }
}
