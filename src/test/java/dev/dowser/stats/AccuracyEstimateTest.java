package dev.dowser.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

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
        // Every v_m = 1: LURE is the plain share right, and the interval is the counts' own.
        double[] right = {1, 1, 0, 1, 1, 1, 1, 0, 1, 1};
        double[] v = new double[10];
        java.util.Arrays.fill(v, 1);
        AccuracyEstimate e = AccuracyEstimate.weighted(right, v);
        AccuracyEstimate counted = AccuracyEstimate.ofChecks(8, 10);
        assertEquals(0.8, e.accuracy(), 1e-12);
        assertEquals(counted.lower(), e.lower(), 1e-12);
        assertEquals(counted.upper(), e.upper(), 1e-12);
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
