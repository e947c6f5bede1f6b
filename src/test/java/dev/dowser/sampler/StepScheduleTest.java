package dev.dowser.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/** The cyclical cosine schedule of Zhang et al. (2020, eq. 1), checked at hand-computed points. */
class StepScheduleTest {

    @Test
    void cyclicalValuesForA0HalfK100M4() {
        // a0 = 0.5, K = 100, M = 4, so ceil(K/M) = 25: a_k = 0.25 (cos(pi mod(k-1, 25) / 25) + 1).
        StepSchedule s = StepSchedule.cyclical(4);
        assertEquals(0.5, s.stepSize(0.5, 1, 100), 1e-12);
        assertEquals(0.265698, s.stepSize(0.5, 13, 100), 1e-6);
        assertEquals(0.001971, s.stepSize(0.5, 25, 100), 1e-6);
        assertEquals(0.5, s.stepSize(0.5, 26, 100), 1e-12);
    }

    @Test
    void constantStaysPut() {
        assertEquals(0.01, StepSchedule.CONSTANT.stepSize(0.01, 77, 100), 0);
    }
}
