package dev.dowser.stats;

/**
 * The Wilson score interval for a binomial proportion (Wilson 1927, "Probable inference, the law
 * of succession, and statistical inference"): the p with |p_hat - p| <= z sqrt(p (1 - p) / n),
 * centre (p_hat + z^2 / 2n) / (1 + z^2 / n), half-width
 * z sqrt(p_hat (1 - p_hat) / n + z^2 / 4n^2) / (1 + z^2 / n).
 */
public record Wilson(double lower, double upper) {

    /** z for a two-sided 95% interval: the normal's 97.5% point. */
    public static final double Z95 = Normal.quantile(0.975);

    public static Wilson of(long successes, long trials, double z) {
        if (trials <= 0 || successes < 0 || successes > trials) {
            throw new IllegalArgumentException("need 0 <= successes <= trials and trials > 0, got " + successes
                    + " of " + trials);
        }
        return around((double) successes / trials, trials, z);
    }

    public static Wilson of95(long successes, long trials) {
        return of(successes, trials, Z95);
    }

    /**
     * The interval around a proportion {@code p} worth {@code n} trials, where n may be an effective
     * sample size (Kish 1965) rather than a count: a weighted estimate's variance is p (1 - p) / n.
     */
    public static Wilson around(double p, double n, double z) {
        if (!(p >= 0 && p <= 1) || !(n > 0) || Double.isInfinite(n)) {
            throw new IllegalArgumentException("need 0 <= p <= 1 and a finite n > 0, got p = " + p + ", n = " + n);
        }
        double z2 = z * z;
        double denominator = 1 + z2 / n;
        // centre = (p + z^2/2n) / (1 + z^2/n)
        double centre = (p + z2 / (2 * n)) / denominator;
        // half = z sqrt(p(1-p)/n + z^2/4n^2) / (1 + z^2/n)
        double half = halfWidth(p, n, z);
        return new Wilson(Math.max(0, centre - half), Math.min(1, centre + half));
    }

    /** The interval's half-width at proportion p after n trials. */
    public static double halfWidth(double p, double n, double z) {
        double z2 = z * z;
        return z * Math.sqrt(p * (1 - p) / n + z2 / (4 * n * n)) / (1 + z2 / n);
    }

    /**
     * The fewest trials whose interval, should the proportion stay at {@code p}, is at most
     * {@code halfWidth} either side: the half-width falls as n grows, so a bisection finds it.
     */
    public static long trialsFor(double p, double halfWidth, double z) {
        if (!(p >= 0 && p <= 1) || !(halfWidth > 0 && halfWidth < 0.5)) {
            throw new IllegalArgumentException("need 0 <= p <= 1 and 0 < half-width < 0.5, got " + p + ", "
                    + halfWidth);
        }
        long lo = 0;
        long hi = 1;
        while (halfWidth(p, hi, z) > halfWidth) {
            lo = hi;
            hi *= 2;
        }
        while (hi - lo > 1) {
            long mid = (lo + hi) >>> 1;
            if (halfWidth(p, mid, z) > halfWidth) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return hi;
    }

    public double halfWidth() {
        return (upper - lower) / 2;
    }
}
