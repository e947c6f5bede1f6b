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
     * 0-1 loss, with {@code v} the picks' weights ({@link Lure#weights}); the interval is Wilson's
     * around it with the effective number of picks. {@code right[m]} is 1 where the prediction
     * made before the label was known matched it.
     */
    public static AccuracyEstimate weighted(double[] right, double[] v) {
        if (right.length == 0) {
            return new AccuracyEstimate(Double.NaN, 0, 1, 0, 0);
        }
        double[] loss = new double[right.length];
        for (int m = 0; m < right.length; m++) {
            loss[m] = 1 - right[m];
        }
        // accuracy = 1 - R_LURE of the 0-1 loss; a single realisation can leave [0, 1], the truth cannot.
        double accuracy = Math.max(0, Math.min(1, 1 - Lure.risk(loss, v)));
        double worth = Lure.effectivePicks(v);
        Wilson w = Wilson.around(accuracy, worth, Wilson.Z95);
        return new AccuracyEstimate(accuracy, w.lower(), w.upper(), right.length, worth);
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
