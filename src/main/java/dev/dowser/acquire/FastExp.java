package dev.dowser.acquire;

/**
 * exp(u) for u <= 0 over an array, in a loop the JIT turns into vector instructions (a call to
 * Math.exp per element does not vectorise and cost the scorer a third of its time). The argument
 * is scaled down, exp(u) = exp(u / 2^10)^(2^10): the Taylor polynomial of degree 6 is then exact
 * to about 1e-14 where it matters (u > -40; below, exp(u) < 5e-18 next to the row maximum's 1),
 * and ten squarings restore the power, amplifying that error 1024 times to about 1e-11.
 */
final class FastExp {

    /** Below this the result underflows to zero anyway; the clamp keeps the polynomial positive. */
    static final double FLOOR = -700;

    private FastExp() {
    }

    /** out[i] = exp(u[i]) for i < count; each u[i] must be at most 0. */
    static void exp(double[] u, double[] out, int count) {
        for (int i = 0; i < count; i++) {
            double t = Math.max(u[i], FLOOR) * 0x1p-10;
            double p = 1 + t * (1 + t * (1.0 / 2 + t * (1.0 / 6 + t * (1.0 / 24 + t * (1.0 / 120 + t * (1.0 / 720))))));
            p *= p;
            p *= p;
            p *= p;
            p *= p;
            p *= p;
            p *= p;
            p *= p;
            p *= p;
            p *= p;
            p *= p;
            out[i] = p;
        }
    }
}
