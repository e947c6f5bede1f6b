package dev.dowser.stats;

/**
 * An accuracy with its 95% interval.
 *
 * @param accuracy the estimate
 * @param lower    the interval's lower end
 * @param upper    the interval's upper end
 * @param labels   how many labels it was computed from
 * @param worth    how many uniformly drawn labels it is worth (its effective sample size); equal to
 *                 {@code labels} for a plain count
 */
public record AccuracyEstimate(double accuracy, double lower, double upper, int labels, double worth) {

    /** Half the interval's width that people are told how to reach: +-5 points. */
    public static final double TARGET_HALF_WIDTH = 0.05;

    /** From uniform checks: {@code correct} of {@code checked} were right; Wilson's (1927) interval. */
    public static AccuracyEstimate ofChecks(long correct, long checked) {
        if (checked == 0) {
            return new AccuracyEstimate(Double.NaN, 0, 1, 0, 0);
        }
        Wilson w = Wilson.of95(correct, checked);
        return new AccuracyEstimate((double) correct / checked, w.lower(), w.upper(), (int) checked, checked);
    }

    /**
     * From labels picked with known probabilities: LURE (Farquhar, Gal & Rainforth 2021) of the
     * 0-1 loss, with {@code v} the picks' weights ({@link Lure#weights}); {@code right[m]} is 1
     * where the prediction made before the label was known matched it.
     *
     * <p>The interval: R_LURE is the mean of the terms t_m = v_m L_m, so its variance is estimated
     * by their sample variance over M, s_t^2 / M (the usual importance-sampling estimate), and the
     * normal interval 1 - R +- z s_t / sqrt(M) is widened where needed to Wilson's for M uniform
     * labels at the same accuracy: weighting is not allowed to claim more than M labels could tell,
     * and with no error among the picks (every t_m = 0) Wilson's interval still has width. A pick
     * that was very unlikely and right adds nothing to the sum and little to s_t; one that was
     * wrong moves the estimate and widens the interval a lot, as it should.
     */
    public static AccuracyEstimate weighted(double[] right, double[] v) {
        int m = right.length;
        if (m == 0) {
            return new AccuracyEstimate(Double.NaN, 0, 1, 0, 0);
        }
        double[] loss = new double[m];
        for (int i = 0; i < m; i++) {
            loss[i] = 1 - right[i];
        }
        double risk = Lure.risk(loss, v);
        // accuracy = 1 - R_LURE of the 0-1 loss; a single realisation can leave [0, 1], the truth cannot.
        double accuracy = Math.max(0, Math.min(1, 1 - risk));
        // s_t^2 = sum (t_m - R)^2 / (M - 1), t_m = v_m L_m; Var(R) ~ s_t^2 / M.
        double ss = 0;
        for (int i = 0; i < m; i++) {
            double t = v[i] * loss[i] - risk;
            ss += t * t;
        }
        double variance = m > 1 ? ss / (m - 1) / m : Double.POSITIVE_INFINITY;
        double half = Wilson.Z95 * Math.sqrt(variance);
        Wilson floor = Wilson.around(accuracy, m, Wilson.Z95);
        double lower = Math.max(0, Math.min(floor.lower(), accuracy - half));
        double upper = Math.min(1, Math.max(floor.upper(), accuracy + half));
        // Worth: the uniform labels with the same variance at this accuracy, at most M.
        double p = accuracy * (1 - accuracy);
        double worth = variance > 0 && p > 0 ? Math.min(m, p / variance) : m;
        return new AccuracyEstimate(accuracy, lower, upper, m, worth);
    }

    public boolean known() {
        return labels > 0;
    }

    /**
     * Further uniform checks that would narrow the interval to +-{@code halfWidth}, should the
     * accuracy stay where it is (at 0.5, the widest case, while nothing is known); 0 when it is
     * narrow enough already.
     */
    public long moreChecksFor(double halfWidth) {
        double p = known() ? accuracy : 0.5;
        return Math.max(0, Wilson.trialsFor(p, halfWidth, Wilson.Z95) - (long) Math.floor(worth));
    }
}
