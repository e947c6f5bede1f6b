package dev.dowser.acquire;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * The vectorisable exponential against the JDK's {@code StrictMath.exp} (fdlibm, within one ulp
 * of the true value by the java.lang.StrictMath specification).
 */
class FastExpTest {

    @Test
    void relativeErrorBelowTenToTheMinusTenWhereTheValueCounts() {
        SplittableRandom rng = new SplittableRandom(11);
        int n = 200_000;
        double[] u = new double[n];
        for (int i = 0; i < n; i++) {
            u[i] = -rng.nextDouble() * 40;
        }
        u[0] = 0;
        u[1] = -1e-300;
        double[] out = new double[n];
        FastExp.exp(u, out, n);
        double worst = 0;
        for (int i = 0; i < n; i++) {
            double want = StrictMath.exp(u[i]);
            worst = Math.max(worst, Math.abs(out[i] - want) / want);
        }
        assertTrue(worst < 1e-10, "worst relative error " + worst);
        assertEquals(1.0, out[0], 0);
    }

    @Test
    void farBelowUnderflowsToZeroNotGarbage() {
        double[] u = {-745, -1e4, -1e300, Double.NEGATIVE_INFINITY};
        double[] out = new double[u.length];
        FastExp.exp(u, out, u.length);
        for (double v : out) {
            assertTrue(v >= 0 && v < 1e-300, "got " + v);
        }
    }
}
