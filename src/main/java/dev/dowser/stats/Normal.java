package dev.dowser.stats;

/** The standard normal distribution's CDF and its inverse. */
public final class Normal {

    private static final double LOG_SQRT_2PI = 0.91893853320467274178;

    private Normal() {
    }

    /**
     * Phi(x): for |x| <= 3 by Marsaglia's Taylor series (Marsaglia 2004, "Evaluating the Normal
     * Distribution", J. Stat. Software 11(4)): Phi(x) = 1/2 + phi(x) (x + x^3/3 + x^5/(3*5) + ...);
     * in the tails by a continued fraction, so small probabilities keep their relative accuracy.
     */
    public static double cdf(double x) {
        if (x < -TAIL) {
            return lowerTail(x);
        }
        if (x > TAIL) {
            return 1 - lowerTail(-x);
        }
        double s = x;
        double t = 0;
        double b = x;
        double q = x * x;
        double i = 1;
        while (s != t) {
            t = s;
            i += 2;
            b *= q / i;
            s = t + b;
        }
        return 0.5 + s * Math.exp(-0.5 * q - LOG_SQRT_2PI);
    }

    /** Past this |x| the series loses digits to cancellation and the continued fraction takes over. */
    private static final double TAIL = 3;

    /**
     * Phi(x) for x < -3 from the continued fraction of Mills' ratio (Abramowitz & Stegun 26.2.14):
     * Phi(x) = phi(x) / (t + 1/(t + 2/(t + 3/(t + ...)))) with t = -x, evaluated from the back;
     * relative accuracy holds far into the tail, where 1/2 + series would cancel.
     */
    private static double lowerTail(double x) {
        double t = -x;
        double f = t;
        for (int k = 80; k >= 1; k--) {
            f = t + k / f;
        }
        return density(x) / f;
    }

    public static double density(double x) {
        return Math.exp(-0.5 * x * x - LOG_SQRT_2PI);
    }

    /**
     * Phi^-1(p) for 0 < p < 1: Newton's method on {@link #cdf}, kept inside a shrinking bracket
     * (a step that would leave it bisects instead), from a logistic first guess.
     */
    public static double quantile(double p) {
        if (!(p > 0 && p < 1)) {
            throw new IllegalArgumentException("a normal quantile needs 0 < p < 1, got " + p);
        }
        double lo = -40;
        double hi = 40;
        // The logistic distribution with scale sqrt(3)/pi has the normal's variance: a close start.
        double x = Math.max(lo, Math.min(hi, Math.sqrt(3) / Math.PI * Math.log(p / (1 - p))));
        for (int i = 0; i < 200; i++) {
            double f = cdf(x) - p;
            if (f == 0) {
                return x;
            }
            if (f < 0) {
                lo = x;
            } else {
                hi = x;
            }
            double next = x - f / density(x);
            if (!(next > lo && next < hi)) {
                next = 0.5 * (lo + hi);
            }
            if (Math.abs(next - x) < 1e-15 * Math.max(1, Math.abs(x)) || hi - lo < 1e-15) {
                return next;
            }
            x = next;
        }
        return x;
    }
}
