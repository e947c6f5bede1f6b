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
        double n = trials;
        double p = successes / n;
        double z2 = z * z;
        double denominator = 1 + z2 / n;
        double centre = (p + z2 / (2 * n)) / denominator;
        double half = z * Math.sqrt(p * (1 - p) / n + z2 / (4 * n * n)) / denominator;
        return new Wilson(Math.max(0, centre - half), Math.min(1, centre + half));
    }

    public static Wilson of95(long successes, long trials) {
        return of(successes, trials, Z95);
    }
}
