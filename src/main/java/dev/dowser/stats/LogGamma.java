package dev.dowser.stats;

/**
 * log Gamma(x) for x > 0: Stirling's series (Abramowitz & Stegun 1964, 6.1.41) with terms to
 * 1/x^7, after lifting x to at least 10 by the recurrence Gamma(x + 1) = x Gamma(x), which keeps the
 * truncation error (below the first omitted term, 1/(1188 x^9)) under 1e-11.
 */
public final class LogGamma {

    private static final double HALF_LOG_2PI = 0.5 * Math.log(2 * Math.PI);

    private LogGamma() {
    }

    public static double of(double x) {
        if (!(x > 0) || Double.isInfinite(x)) {
            throw new IllegalArgumentException("log Gamma needs a positive finite argument, got " + x);
        }
        double shift = 0;
        while (x < 10) {
            shift -= Math.log(x);
            x += 1;
        }
        double inv = 1 / x;
        double inv2 = inv * inv;
        double series = inv * (1.0 / 12 - inv2 * (1.0 / 360 - inv2 * (1.0 / 1260 - inv2 / 1680)));
        return shift + (x - 0.5) * Math.log(x) - x + HALF_LOG_2PI + series;
    }
}
