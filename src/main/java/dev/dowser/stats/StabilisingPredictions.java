package dev.dowser.stats;

import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.SplittableRandom;

/**
 * The stopping rule of stabilising predictions (Bloodgood & Vijay-Shanker 2009, "A Method for
 * Stopping Active Learning Based on Stabilizing Predictions and the Need for User-Adjustable
 * Stopping", CoNLL): keep a stop set of unlabelled records fixed from the start, compare each
 * round's predicted classes on it with the previous round's by Cohen's kappa, and stop once the
 * mean kappa of the last {@code window} comparisons reaches {@code threshold}. The paper uses a
 * window of 3 and a threshold of 0.99 (from memory), and a stop set of a few thousand records; a
 * pool's own threshold is its {@code stop_agreement} setting.
 *
 * @param window    comparisons averaged
 * @param threshold the mean kappa at which predictions count as stable
 */
public record StabilisingPredictions(int window, double threshold) {

    /** The paper's window: comparisons averaged. */
    public static final int DEFAULT_WINDOW = 3;
    /** The paper's threshold; a pool's default is stricter (PoolSettings.DEFAULT_STOP_AGREEMENT). */
    public static final double PUBLISHED_THRESHOLD = 0.99;
    /** Records in the stop set, at most (the paper's sets held about 2,000). */
    public static final int STOP_SET_RECORDS = 2_000;

    public StabilisingPredictions {
        if (window < 1) {
            throw new IllegalArgumentException("the window must hold at least one comparison, got " + window);
        }
        if (!(threshold > 0 && threshold <= 1)) {
            throw new IllegalArgumentException("the kappa threshold must lie in (0, 1], got " + threshold);
        }
    }

    /** The rule as published: the mean of the last 3 kappas at least 0.99. */
    public static StabilisingPredictions published() {
        return new StabilisingPredictions(DEFAULT_WINDOW, PUBLISHED_THRESHOLD);
    }

    /**
     * The stop set of a pool of {@code records}: {@code min(size, records)} distinct rows drawn
     * uniformly, in ascending order. Floyd's algorithm (Bentley & Floyd 1987, "A sample of
     * brilliance", CACM 30(9)): for j = n - k .. n - 1 draw t in [0, j]; take t unless taken, else j.
     * The same generator state gives the same set, so a pool's stop set never changes.
     */
    public static long[] stopSet(long records, int size, SplittableRandom rng) {
        int k = (int) Math.min(size, records);
        Set<Long> chosen = new HashSet<>(2 * k);
        for (long j = records - k; j < records; j++) {
            long t = rng.nextLong(j + 1);
            chosen.add(chosen.contains(t) ? j : t);
        }
        long[] rows = chosen.stream().mapToLong(Long::longValue).toArray();
        Arrays.sort(rows);
        return rows;
    }

    /**
     * Agreement between two rounds' predicted classes on the stop set: Cohen's kappa. Kappa is
     * undefined (NaN) when both rounds predict one class for every record; that counts as not stable.
     */
    public static double agreement(int[] before, int[] after, int classes) {
        return Kappa.cohen(before, after, classes);
    }

    /** The mean of the last {@code window} agreements, oldest first; NaN while there are fewer. */
    public double recentMean(List<Double> agreements) {
        int n = agreements.size();
        if (n < window) {
            return Double.NaN;
        }
        double s = 0;
        for (int i = n - window; i < n; i++) {
            s += agreements.get(i);
        }
        return s / window;
    }

    /** Whether the rule says stop after these agreements (oldest first). */
    public boolean stable(List<Double> agreements) {
        // NaN >= threshold is false: an undefined kappa never counts as stable.
        return recentMean(agreements) >= threshold;
    }

    /** The first index into {@code agreements} after which the rule said stop, or -1 if it never did. */
    public int firstStable(List<Double> agreements) {
        for (int i = window; i <= agreements.size(); i++) {
            if (stable(agreements.subList(0, i))) {
                return i - 1;
            }
        }
        return -1;
    }
}
