package dev.dowser.stats;

import java.util.Arrays;
import java.util.SplittableRandom;
import java.util.function.ToDoubleFunction;

/**
 * The nonparametric bootstrap (Efron 1979; Efron & Tibshirani 1993, "An Introduction to the
 * Bootstrap", ch. 13, the percentile interval): a statistic of n units (seeds) is recomputed on B
 * resamples of the units drawn with replacement, and the interval is cut from the replicates'
 * quantiles. Paired: one set of resamples serves every statistic compared, so each replicate sees
 * the same seeds for every strategy.
 */
public final class Bootstrap {

    public static final int DEFAULT_RESAMPLES = 2_000;

    /** An interval, with the share of replicates where the statistic was undefined (NaN), left out. */
    public record Interval(double lower, double upper, double undefinedShare) {
    }

    private final int[][] resamples;

    /** {@code b} resamples of {@code n} units, each unit index drawn uniformly with replacement. */
    public Bootstrap(int n, int b, SplittableRandom rng) {
        if (n < 1 || b < 1) {
            throw new IllegalArgumentException("need at least one unit and one resample, got " + n + " and " + b);
        }
        resamples = new int[b][n];
        for (int[] r : resamples) {
            for (int i = 0; i < n; i++) {
                r[i] = rng.nextInt(n);
            }
        }
    }

    public int size() {
        return resamples.length;
    }

    /** Resample {@code k}: which units it holds (with repeats). */
    public int[] resample(int k) {
        return resamples[k].clone();
    }

    /** The statistic on every resample. */
    public double[] replicates(ToDoubleFunction<int[]> statistic) {
        double[] out = new double[resamples.length];
        for (int k = 0; k < resamples.length; k++) {
            out[k] = statistic.applyAsDouble(resamples[k]);
        }
        return out;
    }

    /**
     * The percentile interval at {@code level} (0.9: the 5% and 95% quantiles) of the defined
     * replicates; infinities stay, so a statistic that may not exist (a target never reached) shows
     * as an open end. Quantiles are R's type 7 (linear between order statistics).
     */
    public static Interval percentile(double[] replicates, double level) {
        if (!(level > 0 && level < 1)) {
            throw new IllegalArgumentException("the level must lie strictly between 0 and 1, got " + level);
        }
        double[] defined = Arrays.stream(replicates).filter(v -> !Double.isNaN(v)).sorted().toArray();
        double undefined = 1 - (double) defined.length / replicates.length;
        if (defined.length == 0) {
            return new Interval(Double.NaN, Double.NaN, 1);
        }
        double tail = (1 - level) / 2;
        return new Interval(quantile(defined, tail), quantile(defined, 1 - tail), undefined);
    }

    /** The q-quantile of sorted values, type 7: h = (n - 1) q, linear between floor(h) and floor(h) + 1. */
    static double quantile(double[] sorted, double q) {
        double h = (sorted.length - 1) * q;
        int lo = (int) Math.floor(h);
        int hi = Math.min(sorted.length - 1, lo + 1);
        double frac = h - lo;
        if (frac == 0 || sorted[lo] == sorted[hi]) {
            return sorted[lo];
        }
        // Past an infinite order statistic (a target some replicates never reach) the quantile is infinite too.
        if (Double.isInfinite(sorted[hi]) || Double.isInfinite(sorted[lo])) {
            return sorted[hi];
        }
        return sorted[lo] + frac * (sorted[hi] - sorted[lo]);
    }
}
