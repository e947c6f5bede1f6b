package dev.dowser.advice;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.stats.AccuracyEstimate;
import dev.dowser.stats.LearningCurve;
import dev.dowser.stats.StabilisingPredictions;
import java.util.List;
import org.junit.jupiter.api.Test;

/** The card's wording in each state, from evidence made to order. */
class StopAdviceTest {

    private static final StabilisingPredictions RULE = StabilisingPredictions.published();

    /** A curve a - b n^-c fitted to exact points, so its gains are the curve's own. */
    private static LearningCurve curve(double a, double b, double c, int upTo) {
        int k = upTo / 10;
        double[] n = new double[k];
        double[] y = new double[k];
        double[] w = new double[k];
        for (int i = 0; i < k; i++) {
            n[i] = 10 * (i + 1);
            y[i] = a - b * Math.pow(n[i], -c);
            w[i] = 10;
        }
        return LearningCurve.fit(n, y, w);
    }

    @Test
    void atTheStartThereIsNoModel() {
        StopAdvice a = StopAdvice.of(new StopAdvice.Evidence(0, AccuracyEstimate.ofChecks(0, 0), List.of(), RULE,
                null));
        assertEquals(StopAdvice.State.START, a.state());
        assertTrue(a.headline().startsWith("No model yet"), a.headline());
    }

    @Test
    void eachStateHasTheWordThePageStylesTheCardBy() {
        // web/css/dowser.css colours .keep-paying, .keep-slowing and .keep-settled; overview.js adds keep-<word>.
        assertEquals(List.of("start", "early", "paying", "slowing", "settled"),
                dev.dowser.words.Worded.words(StopAdvice.State.class));
    }

    @Test
    void earlyItSaysItIsTooEarly() {
        StopAdvice a = StopAdvice.of(new StopAdvice.Evidence(30, AccuracyEstimate.ofChecks(2, 3), List.of(0.6), RULE,
                null));
        assertEquals(StopAdvice.State.EARLY, a.state());
        assertEquals("Too early to tell: the last round learnt from 30 labels. After a few more rounds Dowser can say"
                + " whether labels are still paying.", a.headline());
        assertTrue(a.details().get(0).startsWith("Agreement of the last two rounds' predictions: 0.600"),
                a.details().get(0));
    }

    @Test
    void midwayLabelsStillPay() {
        // 0.95 - 1.4 n^-0.7: from 100 to 200 labels it gains 100 * 1.4 (100^-0.7 - 200^-0.7) = 2.14 points.
        LearningCurve c = curve(0.95, 1.4, 0.7, 100);
        StopAdvice a = StopAdvice.of(new StopAdvice.Evidence(100, AccuracyEstimate.ofChecks(8, 10),
                List.of(0.8, 0.9, 0.93), RULE, c));
        assertEquals(StopAdvice.State.PAYING, a.state());
        assertEquals("Labels are still paying: about +2 points per 100 labels.", a.headline());
        assertTrue(a.details().get(1).startsWith("Projected accuracy from the learning curve: 0."), a.details().get(1));
        assertTrue(a.details().get(1).endsWith("after 1,000 more labels."), a.details().get(1));
    }

    @Test
    void atAPlateauPredictionsHaveSettled() {
        LearningCurve c = curve(0.95, 2, 0.7, 400);
        AccuracyEstimate acc = new AccuracyEstimate(0.93, 0.90, 0.95, 300, 250);
        StopAdvice a = StopAdvice.of(new StopAdvice.Evidence(400, acc, List.of(0.98, 0.99, 0.995, 0.992), RULE, c));
        assertEquals(StopAdvice.State.SETTLED, a.state());
        assertEquals("Predictions have settled: they barely changed over the last 3 rounds; accuracy 0.93"
                + " (0.90-0.95). More labels are unlikely to change it much.", a.headline());
    }

    @Test
    void slowGainsWithShiftingPredictions() {
        LearningCurve c = curve(0.95, 2, 0.7, 1000);
        StopAdvice a = StopAdvice.of(new StopAdvice.Evidence(1000, AccuracyEstimate.ofChecks(80, 90),
                List.of(0.95, 0.96, 0.97), RULE, c));
        assertEquals(StopAdvice.State.SLOWING, a.state());
        assertTrue(a.headline().startsWith("Gains are slowing: about +0."), a.headline());
    }
}
