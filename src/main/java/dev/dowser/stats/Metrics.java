package dev.dowser.stats;

/** Scores of probabilistic predictions against true classes; probabilities are row-major (rows x classes). */
public final class Metrics {

    /** Probabilities are clipped here before a log, so one overconfident miss costs a bounded amount. */
    static final double MIN_PROBABILITY = 1e-12;
    /** Bins of the calibration error: Guo et al.'s (2017) choice, used for every figure Dowser reports. */
    public static final int ECE_BINS = 15;

    private Metrics() {
    }

    public static int argmax(float[] p, int row, int classes) {
        int best = 0;
        for (int k = 1; k < classes; k++) {
            if (p[row * classes + k] > p[row * classes + best]) {
                best = k;
            }
        }
        return best;
    }

    public static double accuracy(float[] p, int[] y, int classes) {
        int right = 0;
        for (int i = 0; i < y.length; i++) {
            if (argmax(p, i, classes) == y[i]) {
                right++;
            }
        }
        return (double) right / y.length;
    }

    /** Mean negative log-likelihood of the true classes, in nats. */
    public static double nll(float[] p, int[] y, int classes) {
        double s = 0;
        for (int i = 0; i < y.length; i++) {
            s -= Math.log(Math.max(MIN_PROBABILITY, p[i * classes + y[i]]));
        }
        return s / y.length;
    }

    /**
     * Expected calibration error (Guo, Pleiss, Sun & Weinberger 2017, "On Calibration of Modern
     * Neural Networks", eq. 3): predictions binned by confidence into M equal-width bins,
     * ECE = sum_m |B_m| / n * |acc(B_m) - conf(B_m)|.
     */
    public static double ece(float[] p, int[] y, int classes) {
        return ece(p, y, classes, ECE_BINS);
    }

    /** As above with {@code bins} bins. */
    public static double ece(float[] p, int[] y, int classes, int bins) {
        double[] conf = new double[bins];
        double[] acc = new double[bins];
        int[] count = new int[bins];
        for (int i = 0; i < y.length; i++) {
            int k = argmax(p, i, classes);
            double c = p[i * classes + k];
            int b = Math.min(bins - 1, (int) Math.floor(c * bins));
            // Bins are (m-1)/M < conf <= m/M: a confidence exactly on an edge belongs to the lower bin.
            if (b > 0 && c == (double) b / bins) {
                b--;
            }
            conf[b] += c;
            acc[b] += k == y[i] ? 1 : 0;
            count[b]++;
        }
        double e = 0;
        for (int b = 0; b < bins; b++) {
            if (count[b] > 0) {
                e += Math.abs(acc[b] / count[b] - conf[b] / count[b]) * count[b] / y.length;
            }
        }
        return e;
    }
}
