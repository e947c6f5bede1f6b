package dev.dowser.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/** The Wilson interval against Newcombe (1998), "Two-sided confidence intervals for the single proportion", Table I, method 3. */
class WilsonTest {

    private static void check(int x, int n, double lower, double upper) {
        Wilson w = Wilson.of95(x, n);
        assertEquals(lower, w.lower(), 5e-5, x + "/" + n + " lower");
        assertEquals(upper, w.upper(), 5e-5, x + "/" + n + " upper");
    }

    @Test
    void newcombeTableOne() {
        check(81, 263, 0.2553, 0.3662);
        check(15, 148, 0.0624, 0.1605);
        check(0, 20, 0.0, 0.1611);
        check(1, 29, 0.0061, 0.1718);
    }
}
