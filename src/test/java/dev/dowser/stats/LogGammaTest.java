package dev.dowser.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.apache.commons.math3.special.Gamma;
import org.junit.jupiter.api.Test;

/** log Gamma against Commons Math's and against exact values: Gamma(n) = (n - 1)!, Gamma(1/2) = sqrt(pi). */
class LogGammaTest {

    @Test
    void agreesWithCommonsMathAndExactValues() {
        for (double x = 0.05; x < 60; x *= 1.3) {
            assertEquals(Gamma.logGamma(x), LogGamma.of(x), 1e-9 * Math.max(1, Math.abs(Gamma.logGamma(x))), "x = " + x);
        }
        assertEquals(Math.log(120), LogGamma.of(6), 1e-10);
        assertEquals(0.5 * Math.log(Math.PI), LogGamma.of(0.5), 1e-10);
    }
}
