package dev.dowser.stats;

/**
 * An inverse power law learning curve, accuracy(n) = a - b n^-c, fitted by weighted least squares
 * to accuracies measured at label counts n (Figueroa, Zeng-Treitler, Kandula & Ngo 2012,
 * "Predicting sample size required for classification performance", BMC Medical Informatics and
 * Decision Making 12:8). a is the accuracy the curve levels off at, b how far below it the curve
 * starts, c how fast it closes the gap.
 *
 * <p>For a fixed c the model is linear in a and b, so the fit profiles them out (variable
 * projection; Golub & Pereyra 1973) and searches c alone: a grid over log c, then golden-section
 * refinement. The parameters' covariance is s^2 (J'WJ)^-1 at the optimum, with s^2 the weighted
 * residual variance; a projection's uncertainty follows by the delta method.
 *
 * @param a          the level the curve approaches
 * @param b          the gap at n = 1
 * @param c          the decay exponent
 * @param covariance the 3 x 3 covariance of (a, b, c), row-major
 * @param points     the measurements fitted
 */
public record LearningCurve(double a, double b, double c, double[] covariance, int points) {

    /** Fewer points than this cannot fit three parameters and estimate their noise. */
    public static final int MIN_POINTS = 5;
    static final double C_MIN = 0.01;
    static final double C_MAX = 4;
    static final int GRID = 80;

    /** A projected accuracy with its 95% interval. */
    public record Projection(double labels, double accuracy, double lower, double upper) {
    }

    /** The curve's value at n labels: a - b n^-c. */
    public double at(double n) {
        return a - b * Math.pow(n, -c);
    }

    /** The curve at n labels, with a 95% interval from the parameters' covariance (delta method). */
    public Projection project(double n) {
        double[] g = gradient(n, b, c);
        double var = 0;
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                var += g[i] * covariance[i * 3 + j] * g[j];
            }
        }
        double half = Wilson.Z95 * Math.sqrt(Math.max(0, var));  // Math.max keeps a NaN
        double y = at(n);
        return new Projection(n, y, y - half, y + half);
    }

    /**
     * The gain from {@code from} labels to {@code from + more}, with a 95% interval (the delta
     * method on the difference, so the shared uncertainty of a cancels).
     */
    public Projection gain(double from, double more) {
        double[] g0 = gradient(from, b, c);
        double[] g1 = gradient(from + more, b, c);
        double[] d = {g1[0] - g0[0], g1[1] - g0[1], g1[2] - g0[2]};
        double var = 0;
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                var += d[i] * covariance[i * 3 + j] * d[j];
            }
        }
        double half = Wilson.Z95 * Math.sqrt(Math.max(0, var));  // Math.max keeps a NaN
        double y = at(from + more) - at(from);
        return new Projection(from + more, y, y - half, y + half);
    }

    /** d f / d(a, b, c) at n: (1, -n^-c, b n^-c ln n). */
    static double[] gradient(double n, double b, double c) {
        double p = Math.pow(n, -c);
        return new double[] {1, -p, b * p * Math.log(n)};
    }

    /**
     * Fits the curve to accuracies {@code y} at label counts {@code n} (each at least 1), each
     * weighted by {@code w} (for example its effective sample size: weights proportional to
     * 1 / variance). Returns null when there are fewer than {@link #MIN_POINTS} points or fewer
     * than three distinct label counts.
     */
    public static LearningCurve fit(double[] n, double[] y, double[] w) {
        if (n.length != y.length || n.length != w.length) {
            throw new IllegalArgumentException("need as many label counts, accuracies and weights: " + n.length + ", "
                    + y.length + ", " + w.length);
        }
        for (int i = 0; i < n.length; i++) {
            if (!(n[i] >= 1) || !Double.isFinite(y[i]) || !(w[i] > 0) || Double.isInfinite(w[i])) {
                throw new IllegalArgumentException("point " + i + " needs n >= 1, a finite accuracy and a positive"
                        + " weight; got n = " + n[i] + ", accuracy = " + y[i] + ", weight = " + w[i]);
            }
        }
        if (n.length < MIN_POINTS || java.util.Arrays.stream(n).distinct().count() < 3) {
            return null;
        }
        // Grid over log c, then golden section between the best grid point's neighbours.
        double step = Math.log(C_MAX / C_MIN) / (GRID - 1);
        int best = 0;
        double bestRss = Double.POSITIVE_INFINITY;
        for (int k = 0; k < GRID; k++) {
            double rss = linear(n, y, w, C_MIN * Math.exp(k * step))[2];
            if (rss < bestRss) {
                bestRss = rss;
                best = k;
            }
        }
        double lo = Math.log(C_MIN) + Math.max(0, best - 1) * step;
        double hi = Math.log(C_MIN) + Math.min(GRID - 1, best + 1) * step;
        double logC = golden(n, y, w, lo, hi);
        double c = Math.exp(logC);
        double[] ab = linear(n, y, w, c);
        return new LearningCurve(ab[0], ab[1], c, covariance(n, y, w, ab[0], ab[1], c), n.length);
    }

    /**
     * For fixed c, weighted least squares of y on x = n^-c: y = a - b x. Returns {a, b, rss}.
     */
    static double[] linear(double[] n, double[] y, double[] w, double c) {
        double sw = 0;
        double sx = 0;
        double sy = 0;
        for (int i = 0; i < n.length; i++) {
            double x = Math.pow(n[i], -c);
            sw += w[i];
            sx += w[i] * x;
            sy += w[i] * y[i];
        }
        double mx = sx / sw;
        double my = sy / sw;
        double sxx = 0;
        double sxy = 0;
        for (int i = 0; i < n.length; i++) {
            double dx = Math.pow(n[i], -c) - mx;
            sxx += w[i] * dx * dx;
            sxy += w[i] * dx * (y[i] - my);
        }
        // slope of y on x is -b; the intercept at x = 0 (n -> infinity) is a.
        double slope = sxx > 0 ? sxy / sxx : 0;
        double a = my - slope * mx;
        double b = -slope;
        double rss = 0;
        for (int i = 0; i < n.length; i++) {
            double r = y[i] - (a - b * Math.pow(n[i], -c));
            rss += w[i] * r * r;
        }
        return new double[] {a, b, rss};
    }

    private static double golden(double[] n, double[] y, double[] w, double lo, double hi) {
        double ratio = (Math.sqrt(5) - 1) / 2;
        double x1 = hi - ratio * (hi - lo);
        double x2 = lo + ratio * (hi - lo);
        double f1 = linear(n, y, w, Math.exp(x1))[2];
        double f2 = linear(n, y, w, Math.exp(x2))[2];
        for (int i = 0; i < 100 && hi - lo > 1e-10; i++) {
            if (f1 <= f2) {
                hi = x2;
                x2 = x1;
                f2 = f1;
                x1 = hi - ratio * (hi - lo);
                f1 = linear(n, y, w, Math.exp(x1))[2];
            } else {
                lo = x1;
                x1 = x2;
                f1 = f2;
                x2 = lo + ratio * (hi - lo);
                f2 = linear(n, y, w, Math.exp(x2))[2];
            }
        }
        return (lo + hi) / 2;
    }

    /** s^2 (J'WJ)^-1 with s^2 = sum w r^2 / (k - 3); NaN where J'WJ is singular (the uncertainty is unknown). */
    static double[] covariance(double[] n, double[] y, double[] w, double a, double b, double c) {
        double[] jtj = new double[9];
        double rss = 0;
        for (int i = 0; i < n.length; i++) {
            double[] g = gradient(n[i], b, c);
            for (int r = 0; r < 3; r++) {
                for (int s = 0; s < 3; s++) {
                    jtj[r * 3 + s] += w[i] * g[r] * g[s];
                }
            }
            double res = y[i] - (a - b * Math.pow(n[i], -c));
            rss += w[i] * res * res;
        }
        double s2 = rss / (n.length - 3);
        double[] inv = inverse3(jtj);
        for (int i = 0; i < 9; i++) {
            inv[i] *= s2;
        }
        return inv;
    }

    /** The inverse of a 3 x 3 matrix by cofactors; all NaN when it is (numerically) singular. */
    static double[] inverse3(double[] m) {
        double c00 = m[4] * m[8] - m[5] * m[7];
        double c01 = m[5] * m[6] - m[3] * m[8];
        double c02 = m[3] * m[7] - m[4] * m[6];
        double det = m[0] * c00 + m[1] * c01 + m[2] * c02;
        double scale = Math.abs(m[0] * m[4] * m[8]) + Math.abs(m[1] * m[5] * m[6]) + Math.abs(m[2] * m[3] * m[7]);
        if (!(Math.abs(det) > 1e-14 * scale)) {
            double[] unknown = new double[9];
            java.util.Arrays.fill(unknown, Double.NaN);
            return unknown;
        }
        double[] inv = {
            c00, m[2] * m[7] - m[1] * m[8], m[1] * m[5] - m[2] * m[4],
            c01, m[0] * m[8] - m[2] * m[6], m[2] * m[3] - m[0] * m[5],
            c02, m[1] * m[6] - m[0] * m[7], m[0] * m[4] - m[1] * m[3]};
        for (int i = 0; i < 9; i++) {
            inv[i] /= det;
        }
        return inv;
    }
}
