package dev.dowser.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/** Normal CDF and quantile, and Gamma draws, against Apache Commons Math 3.6.1 as the reference. */
class NormalTest {

    private final NormalDistribution reference = new NormalDistribution(0, 1);

    @Test
    void cdfMatchesTheReference() {
        for (double x = -7.5; x <= 7.5; x += 0.01) {
            double p = reference.cumulativeProbability(x);
            assertEquals(p, Normal.cdf(x), 1e-14, "x = " + x);
            if (x < -3) {
                assertEquals(p, Normal.cdf(x), 1e-10 * p, "relative, in the tail, x = " + x);
            }
        }
    }

    @Test
    void quantileMatchesTheReference() {
        for (double p : new double[] {1e-6, 0.001, 0.025, 0.1, 0.3, 0.5, 0.7, 0.975, 0.999, 1 - 1e-6}) {
            assertEquals(reference.inverseCumulativeProbability(p), Normal.quantile(p), 1e-9, "p = " + p);
        }
        // Far in the tail Commons Math's inverse is good to about 1e-8 only; Wichura's AS241
        // (1988), as Python 3.11's statistics.NormalDist.inv_cdf computes it, gives these:
        assertEquals(-6.361340902404056, Normal.quantile(1e-10), 1e-12);
        assertEquals(-4.753424308822899, Normal.quantile(1e-6), 1e-12);
        assertEquals(-3.090232306167813, Normal.quantile(0.001), 1e-12);
        // A textbook value: the 97.5% point of the standard normal is 1.959964 (any normal table).
        assertEquals(1.959964, Normal.quantile(0.975), 1e-6);
    }

    /**
     * Ziggurat normals: a Kolmogorov-Smirnov test against the normal CDF of Commons Math, and the
     * first four moments. With n = 10^6 the 1% critical value of D is 1.63 / sqrt(n) (any KS table).
     */
    @Test
    void zigguratDrawsAreStandardNormal() {
        SplittableRandom rng = new SplittableRandom(2000);
        int n = 1_000_000;
        double[] x = new double[n];
        double m1 = 0;
        double m2 = 0;
        double m4 = 0;
        for (int i = 0; i < n; i++) {
            x[i] = RandomVariates.normal(rng);
            m1 += x[i];
            m2 += x[i] * x[i];
            m4 += x[i] * x[i] * x[i] * x[i];
        }
        assertEquals(0, m1 / n, 5 / Math.sqrt(n));
        assertEquals(1, m2 / n, 5 * Math.sqrt(2.0 / n));
        assertEquals(3, m4 / n, 5 * Math.sqrt(96.0 / n));
        java.util.Arrays.sort(x);
        double d = 0;
        for (int i = 0; i < n; i++) {
            double f = reference.cumulativeProbability(x[i]);
            d = Math.max(d, Math.max(f - (double) i / n, (i + 1.0) / n - f));
        }
        assertTrue(d < 1.63 / Math.sqrt(n), "KS distance " + d);
        // The tails are reached: beyond the ziggurat's base r = 3.44 about 2.9e-4 of draws fall.
        long tail = java.util.Arrays.stream(x).filter(v -> Math.abs(v) > 3.442619855899).count();
        assertEquals(2 * (1 - reference.cumulativeProbability(3.442619855899)) * n, tail, 5 * Math.sqrt(tail));
    }

    @Test
    void gammaDrawsHaveTheRightMoments() {
        SplittableRandom rng = new SplittableRandom(11);
        for (double[] sr : new double[][] {{0.5, 2}, {2, 1}, {40.5, 3}}) {
            GammaDistribution g = new GammaDistribution(sr[0], 1 / sr[1]);
            int n = 200_000;
            double sum = 0;
            double sumSq = 0;
            for (int i = 0; i < n; i++) {
                double v = RandomVariates.gamma(rng, sr[0], sr[1]);
                sum += v;
                sumSq += v * v;
            }
            double mean = sum / n;
            double var = sumSq / n - mean * mean;
            // Standard error of the mean is sd / sqrt(n); allow five of them.
            assertEquals(g.getNumericalMean(), mean, 5 * Math.sqrt(g.getNumericalVariance() / n), "mean " + sr[0]);
            assertEquals(g.getNumericalVariance(), var, 0.03 * g.getNumericalVariance(), "variance " + sr[0]);
        }
    }
}
