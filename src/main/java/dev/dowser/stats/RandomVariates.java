package dev.dowser.stats;

import java.util.SplittableRandom;

/** Random draws from standard distributions, from a caller's seeded generator. */
public final class RandomVariates {

    private RandomVariates() {
    }

    /**
     * A Gamma(shape, rate) draw by Marsaglia and Tsang (2000), "A simple method for generating
     * gamma variables": for shape >= 1, d = shape - 1/3, c = 1/sqrt(9d), accept d v with
     * v = (1 + c x)^3 when log u < x^2/2 + d - d v + d log v; shape < 1 uses the boost
     * Gamma(shape) = Gamma(shape + 1) u^(1/shape).
     */
    public static double gamma(SplittableRandom rng, double shape, double rate) {
        if (!(shape > 0) || !(rate > 0)) {
            throw new IllegalArgumentException("gamma needs positive shape and rate, got " + shape + ", " + rate);
        }
        if (shape < 1) {
            double u = rng.nextDouble();
            return gamma(rng, shape + 1, rate) * Math.pow(u, 1 / shape);
        }
        double d = shape - 1.0 / 3;
        double c = 1 / Math.sqrt(9 * d);
        while (true) {
            double x;
            double v;
            do {
                x = rng.nextGaussian();
                v = 1 + c * x;
            } while (v <= 0);
            v = v * v * v;
            double u = rng.nextDouble();
            if (u < 1 - 0.0331 * x * x * x * x || Math.log(u) < 0.5 * x * x + d * (1 - v + Math.log(v))) {
                return d * v / rate;
            }
        }
    }
}
