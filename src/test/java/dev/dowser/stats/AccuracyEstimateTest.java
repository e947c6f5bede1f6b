package dev.dowser.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** Accuracy from uniform checks (Wilson 1927) and from weighted picks (LURE; Farquhar et al. 2021). */
class AccuracyEstimateTest {

    @Test
    void checksGiveWilsonsInterval() {
        // Newcombe (1998), Table I: 81 of 263 gives 0.2553 to 0.3662.
        AccuracyEstimate e = AccuracyEstimate.ofChecks(81, 263);
        assertEquals(81.0 / 263, e.accuracy(), 1e-12);
        assertEquals(0.2553, e.lower(), 5e-5);
        assertEquals(0.3662, e.upper(), 5e-5);
        assertEquals(263, e.worth(), 0);
    }

    @Test
    void uniformPicksAreWorthTheirCount() {
        // Every v_m = 1: LURE is the plain share right, and the interval is at least the counts' own.
        double[] right = {1, 1, 0, 1, 1, 1, 1, 0, 1, 1};
        double[] v = new double[10];
        java.util.Arrays.fill(v, 1);
        AccuracyEstimate e = AccuracyEstimate.weighted(right, v);
        AccuracyEstimate counted = AccuracyEstimate.ofChecks(8, 10);
        assertEquals(0.8, e.accuracy(), 1e-12);
        // The normal interval from the sample variance, 0.8 +- 1.96 sqrt(0.8 * 0.2 * 10/9 / 10) =
        // 0.539 to 1.061, joined with Wilson's for 8 of 10 (Newcombe's method 3: 0.490 to 0.943):
        // Wilson's end below, the normal one above, clipped to 1.
        double half = Wilson.Z95 * Math.sqrt(0.8 * 0.2 * 10 / 9 / 10);
        assertEquals(counted.lower(), e.lower(), 1e-12);
        assertEquals(0.4902, e.lower(), 5e-5);
        assertTrue(0.8 + half > 1);
        assertEquals(1, e.upper(), 0);
        assertTrue(e.lower() <= counted.lower() && e.upper() >= counted.upper());
        // No error at all: the sample variance is 0, Wilson's interval for 10 of 10 remains.
        java.util.Arrays.fill(right, 1);
        AccuracyEstimate perfect = AccuracyEstimate.weighted(right, v);
        assertEquals(AccuracyEstimate.ofChecks(10, 10).lower(), perfect.lower(), 1e-12);
        assertEquals(1, perfect.upper(), 0);
    }

    @Test
    void moreChecksToReachPlusMinusFivePoints() {
        // 90 of 100 right: Wilson needs about 141 checks at 0.9 for +-5 points (Cochran's 138 by
        // Wald's interval), so about 41 more.
        AccuracyEstimate e = AccuracyEstimate.ofChecks(90, 100);
        assertEquals(Wilson.trialsFor(0.9, 0.05, Wilson.Z95) - 100, e.moreChecksFor(0.05));
        assertEquals(0, AccuracyEstimate.ofChecks(900, 1000).moreChecksFor(0.05));
        // Nothing checked yet: the widest case, p = 0.5, about 380.
        AccuracyEstimate none = AccuracyEstimate.ofChecks(0, 0);
        assertFalse(none.known());
        assertEquals(Wilson.trialsFor(0.5, 0.05, Wilson.Z95), none.moreChecksFor(0.05));
    }
}
