package dev.dowser.simulate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.rounds.Strategy;
import dev.dowser.stats.Bootstrap;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/** The figures read off learning curves, on curves made by hand so every value is known. */
class LearningCurvesTest {

    /** Accuracy rising linearly from {@code start} by {@code perStep} at 10, 20, ..., 100 labels. */
    private static void line(List<Simulation.Point> out, Strategy s, int seed, double start, double perStep) {
        for (int k = 0; k < 10; k++) {
            out.add(new Simulation.Point(s, seed, 10 * (k + 1), Math.min(1, start + perStep * k), 1 - start, 0, 0));
        }
    }

    @Test
    void crossingsFirstsAndRatios() {
        List<Simulation.Point> pts = new ArrayList<>();
        // bald: seeds reach 0.9 at 30, 40, 40 and 50 labels; random: at 90 and 100 on two seeds, never on two.
        for (int seed = 0; seed < 4; seed++) {
            line(pts, Strategy.BALD, seed, 0.72 - 0.05 * seed, 0.1);
            line(pts, Strategy.RANDOM, seed, 0.5 - 0.05 * seed, 0.05);
        }
        LearningCurves lc = LearningCurves.of(pts, List.of(Strategy.BALD, Strategy.RANDOM), 4);
        // bald's mean curve: 0.645 + 0.1 k, at least 0.9 from k = 3, i.e. 40 labels.
        assertEquals(40, lc.labelsToReach(Strategy.BALD, 0.9));
        assertEquals(4, lc.seedsReaching(Strategy.BALD, 0.9));
        // Firsts 30, 40, 40, 50: the upper middle of four is 40, a count that occurred.
        assertEquals(40, lc.medianFirst(Strategy.BALD, 0.9));
        // random reaches 0.9 on seeds 0 (90) and 1 (100) only: not more than half, so no median count.
        assertEquals(2, lc.seedsReaching(Strategy.RANDOM, 0.9));
        assertEquals(LearningCurves.NEVER, lc.medianFirst(Strategy.RANDOM, 0.9));
        // random's mean curve 0.425 + 0.05 k never reaches 0.9 by 100 labels: the ratio is infinite.
        assertEquals(LearningCurves.NEVER, lc.labelsToReach(Strategy.RANDOM, 0.9));
        assertTrue(Double.isInfinite(lc.savingsRatio(Strategy.BALD, Strategy.RANDOM, 0.9)));
        // At 0.8: bald's mean curve reaches it at k = 2 (30 labels), random's (0.425 + 0.05 k) at k = 8
        // (90 labels): 3 times fewer.
        assertEquals(3.0, lc.savingsRatio(Strategy.BALD, Strategy.RANDOM, 0.8), 1e-12);
        Bootstrap.Interval ci = lc.savingsRatioInterval(Strategy.BALD, Strategy.RANDOM, 0.8);
        assertTrue(ci.lower() <= 3.0 && 3.0 <= ci.upper(), ci.toString());
        // random's area: a straight line's trapezoid area over its span is its mean, (first + last) / 2.
        assertEquals((0.425 + 0.875) / 2, lc.meanArea(Strategy.RANDOM), 1e-9);
        assertEquals(4, lc.areaWins(Strategy.BALD, Strategy.RANDOM));
        // At 50 labels bald's seeds stand at 0.97, 1, 1 and 1 (accuracy is capped at 1): median 1, quartiles
        // by type 7 (Hyndman & Fan 1996), the lower at h = 0.75: 0.97 + 0.75 (1 - 0.97).
        LearningCurves.Spread at50 = lc.accuracyAt(Strategy.BALD, 50);
        assertEquals(1.0, at50.median(), 1e-9);
        assertEquals(0.97 + 0.75 * 0.03, at50.q25(), 1e-9);
        assertEquals(1.0, at50.q75(), 1e-9);
    }

    /**
     * Accuracy at a fixed count prints a centre inside its band: with one seed far behind the
     * others the mean (0.74) lies below the middle half (0.9 to 0.9), so the centre printed is the
     * median, as the plots draw it. The old report printed the mean there and fails this.
     */
    @Test
    void theCentreLiesInsideItsBand() {
        List<Simulation.Point> pts = new ArrayList<>();
        for (int seed = 0; seed < 5; seed++) {
            double start = seed == 0 ? 0.1 : 0.9;
            line(pts, Strategy.POWER, seed, start, 0);
            line(pts, Strategy.RANDOM, seed, start, 0);
        }
        Simulation.Plan plan = new Simulation.Plan(List.of(Strategy.POWER, Strategy.RANDOM), 5, 10, 100, 0.3,
                dev.dowser.rounds.PoolSettings.defaults(), dev.dowser.sampler.SamplerConfig.defaults(), 1);
        StringWriter text = new StringWriter();
        SimulationReport.summary(new PrintWriter(text), pts, plan, List.of(0.8));
        String s = text.toString();
        assertTrue(s.contains("accuracy_at_50_power=0.9000 (0.9000..0.9000)"), s);
        assertTrue(s.contains("accuracy_at_100_random=0.9000 (0.9000..0.9000)"), s);
        java.util.regex.Matcher m = java.util.regex.Pattern.compile(
                "(?m)^(?:accuracy|nll)_at_\\d+_\\w+=([0-9.]+) \\(([0-9.]+)\\.\\.([0-9.]+)\\)$").matcher(s);
        int lines = 0;
        while (m.find()) {
            lines++;
            double centre = Double.parseDouble(m.group(1));
            assertTrue(Double.parseDouble(m.group(2)) <= centre && centre <= Double.parseDouble(m.group(3)), m.group());
        }
        assertEquals(2 * 2 * 2, lines, "accuracy and NLL, two strategies, at 50 and at 100 (the budget): " + s);
        assertTrue(!s.contains("NaN"), s);
    }

    /** The report never prints NaN or a count that did not occur. */
    @Test
    void theSummaryIsHonest() {
        List<Simulation.Point> pts = new ArrayList<>();
        for (int seed = 0; seed < 3; seed++) {
            line(pts, Strategy.POWER, seed, 0.5, 0.01);
            line(pts, Strategy.RANDOM, seed, 0.5, 0.01);
        }
        Simulation.Plan plan = new Simulation.Plan(List.of(Strategy.POWER, Strategy.RANDOM), 3, 10, 100, 0.3,
                dev.dowser.rounds.PoolSettings.defaults(), dev.dowser.sampler.SamplerConfig.defaults(), 1);
        StringWriter text = new StringWriter();
        SimulationReport.summary(new PrintWriter(text), pts, plan, List.of(0.9));
        String s = text.toString();
        assertTrue(!s.contains("NaN"), s);
        assertTrue(s.contains("labels_to_0.9_power=none"), s);
        assertTrue(s.contains("savings_0.9_power=none"), s);
        assertTrue(s.contains("seeds_reaching_0.9_random=0/3"), s);
        assertEquals("0.95", SimulationReport.targetName(0.95));
    }
}
