package dev.dowser.acquire;

/**
 * Acquisition scores of one record from the class probabilities p_s of S posterior draws,
 * {@code p[s * classes + k]}. Sums and logs in double; 0 log 0 = 0.
 */
public final class Scores {

    private Scores() {
    }

    /** Entropy in nats of a distribution over {@code classes} at {@code off}: -sum p log p. */
    static double entropy(float[] p, int off, int classes) {
        double h = 0;
        for (int k = 0; k < classes; k++) {
            double q = p[off + k];
            if (q > 0) {
                h -= q * Math.log(q);
            }
        }
        return h;
    }

    static double entropy(double[] p) {
        double h = 0;
        for (double q : p) {
            if (q > 0) {
                h -= q * Math.log(q);
            }
        }
        return h;
    }

    static double[] mean(float[] p, int draws, int classes) {
        double[] m = new double[classes];
        for (int s = 0; s < draws; s++) {
            for (int k = 0; k < classes; k++) {
                m[k] += p[s * classes + k];
            }
        }
        for (int k = 0; k < classes; k++) {
            m[k] /= draws;
        }
        return m;
    }

    /**
     * BALD: the mutual information between the label and the weights, H[mean_s p_s] - mean_s H[p_s]
     * (Houlsby, Huszar, Ghahramani & Lengyel 2011; Gal, Islam & Ghahramani 2017).
     */
    public static double bald(float[] p, int draws, int classes) {
        double expected = 0;
        for (int s = 0; s < draws; s++) {
            expected += entropy(p, s * classes, classes);
        }
        return Math.max(0, entropy(mean(p, draws, classes)) - expected / draws);
    }

    /** Predictive entropy H[mean_s p_s]. */
    public static double predictiveEntropy(float[] p, int draws, int classes) {
        return entropy(mean(p, draws, classes));
    }

    /**
     * Margin (Scheffer, Decomain & Wrobel 2001): 1 minus the gap between the two largest mean
     * probabilities, so that larger means less sure.
     */
    public static double margin(float[] p, int draws, int classes) {
        double[] m = mean(p, draws, classes);
        double first = Double.NEGATIVE_INFINITY;
        double second = Double.NEGATIVE_INFINITY;
        for (double v : m) {
            if (v > first) {
                second = first;
                first = v;
            } else if (v > second) {
                second = v;
            }
        }
        return 1 - (first - second);
    }
}
