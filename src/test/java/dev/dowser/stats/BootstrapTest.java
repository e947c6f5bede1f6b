package dev.dowser.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.apache.commons.math3.stat.descriptive.rank.Percentile;
import org.junit.jupiter.api.Test;

/** The paired percentile bootstrap, against reference computations on fixed samples. */
class BootstrapTest {

    private static double mean(double[] v, int[] units) {
        double s = 0;
        for (int i : units) {
            s += v[i];
        }
        return s / units.length;
    }

    /**
     * On a fixed sample, the percentile interval equals Commons Math's type-7 percentiles of the same
     * replicates (a reference implementation of the quantile), and for the mean of 400 draws of
     * N(0, 1) it agrees with the normal theory interval mean +- 1.645 s / sqrt(n) to within 0.02
     * (the bootstrap distribution of a mean is near normal at this n; Efron & Tibshirani 1993, ch. 13).
     */
    @Test
    void percentileIntervalMatchesReferences() {
        SplittableRandom data = new SplittableRandom(1);
        double[] x = new double[400];
        for (int i = 0; i < x.length; i++) {
            x[i] = data.nextGaussian();
        }
        Bootstrap boot = new Bootstrap(x.length, 4_000, new SplittableRandom(2));
        double[] reps = boot.replicates(u -> mean(x, u));
        Bootstrap.Interval ci = Bootstrap.percentile(reps, 0.9);
        Percentile ref = new Percentile().withEstimationType(Percentile.EstimationType.R_7);
        assertEquals(ref.evaluate(reps, 5), ci.lower(), 1e-12);
        assertEquals(ref.evaluate(reps, 95), ci.upper(), 1e-12);
        double m = Arrays.stream(x).average().orElseThrow();
        double sd = Math.sqrt(Arrays.stream(x).map(v -> (v - m) * (v - m)).sum() / (x.length - 1));
        double half = 1.6449 * sd / Math.sqrt(x.length);
        assertEquals(m - half, ci.lower(), 0.02);
        assertEquals(m + half, ci.upper(), 0.02);
        assertEquals(0, ci.undefinedShare());
    }

    /** Pairing: every statistic sees the same resample, so a difference of identical samples is exactly 0. */
    @Test
    void pairedResamplesAndOpenEnds() {
        double[] a = {1, 2, 3, 4, 5};
        Bootstrap boot = new Bootstrap(a.length, 500, new SplittableRandom(3));
        double[] diff = boot.replicates(u -> mean(a, u) - mean(a, u));
        assertTrue(Arrays.stream(diff).allMatch(d -> d == 0));
        // A statistic that is infinite in more than 5% of replicates has an open upper end; NaN is left out.
        double[] reps = new double[100];
        for (int i = 0; i < 100; i++) {
            reps[i] = i < 80 ? i : i < 90 ? Double.POSITIVE_INFINITY : Double.NaN;
        }
        Bootstrap.Interval ci = Bootstrap.percentile(reps, 0.9);
        assertEquals(0.1, ci.undefinedShare(), 1e-12);
        assertTrue(Double.isInfinite(ci.upper()));
        // 90 defined replicates, 0..79 then 10 infinities: h = 89 x 0.05 = 4.45, between 4 and 5.
        assertEquals(4.45, ci.lower(), 1e-9);
    }
}
