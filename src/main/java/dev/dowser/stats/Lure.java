package dev.dowser.stats;

/**
 * The levelled unbiased risk estimator, LURE (Farquhar, Gal & Rainforth 2021, "On Statistical Bias
 * in Active Learning: How and When to Fix It", ICLR, section 3). M records i_1..i_M were picked
 * one after another, without replacement, from a pool of N, the m-th with probability q(i_m)
 * among the N - m + 1 records still unpicked. Weighting each pick's loss by v_m makes the mean an
 * unbiased estimate of the mean loss over the whole pool, however the picks favoured some records,
 * provided every record still unpicked had q > 0. Uniform picks have q = 1 / (N - m + 1), so
 * v_m = 1 and LURE is the plain mean.
 */
public final class Lure {

    private Lure() {
    }

    /**
     * The weights v_1..v_M for picks whose probabilities were {@code q} (in pick order) from a pool
     * of {@code n}.
     */
    public static double[] weights(double[] q, long n) {
        int picks = q.length;
        if (picks > n) {
            throw new IllegalArgumentException(picks + " picks from a pool of " + n);
        }
        double[] v = new double[picks];
        for (int i = 0; i < picks; i++) {
            long m = i + 1;
            if (!(q[i] > 0 && q[i] <= 1)) {
                throw new IllegalArgumentException("pick " + m + " has probability " + q[i] + "; it must lie in (0, 1]");
            }
            // v_m = 1 + (N - M) / (N - m) * (1 / ((N - m + 1) q(i_m)) - 1); at m = N the factor is 0 (M = N then).
            double factor = n == m ? 0 : (double) (n - picks) / (n - m);
            v[i] = 1 + factor * (1 / ((n - m + 1) * q[i]) - 1);
        }
        return v;
    }

    /** R_LURE = (1/M) sum_m v_m L_m: the pool's mean loss, estimated from the picks' losses. */
    public static double risk(double[] losses, double[] v) {
        if (losses.length != v.length) {
            throw new IllegalArgumentException(losses.length + " losses for " + v.length + " weights");
        }
        if (losses.length == 0) {
            return Double.NaN;
        }
        double s = 0;
        for (int m = 0; m < losses.length; m++) {
            s += v[m] * losses[m];
        }
        return s / losses.length;
    }
}
