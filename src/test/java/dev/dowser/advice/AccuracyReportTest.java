package dev.dowser.advice;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.stats.AccuracyEstimate;
import dev.dowser.stats.Lure;
import dev.dowser.stats.StabilisingPredictions;
import dev.dowser.stats.Wilson;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The report's bookkeeping: which labels count (a round's labelled prefix of picks, random picks
 * only for LURE), the window of recent rounds, and the per-round points of the learning curve.
 * The estimators themselves are checked against their sources in the stats tests.
 */
class AccuracyReportTest {

    private static final StabilisingPredictions RULE = StabilisingPredictions.published();

    /** A round of 10 picks from n candidates drawn uniformly (q = 1 / (n + 1 - m)), the first {@code wrong} wrong. */
    private static List<AccuracyReport.Scored> uniformRound(int round, int n, int wrong, boolean spotLast) {
        List<AccuracyReport.Scored> out = new ArrayList<>();
        for (int m = 1; m <= 10; m++) {
            out.add(new AccuracyReport.Scored(round, m, 1.0 / (n + 1 - m), spotLast && m == 10, m > wrong));
        }
        return out;
    }

    @Test
    void uniformPicksGiveThePlainShareWithItsWilsonInterval() {
        // Three rounds at 10, 20 and 30 labels: the window (models with at least two thirds of 30
        // labels, widened to 30 picks) takes all three: 27 of 30 right, LURE = plain share.
        List<AccuracyReport.Round> rounds = List.of(new AccuracyReport.Round(1, 10, 100, Double.NaN),
                new AccuracyReport.Round(2, 20, 100, 0.8), new AccuracyReport.Round(3, 30, 100, 0.9));
        List<AccuracyReport.Scored> scored = new ArrayList<>();
        for (int r = 1; r <= 3; r++) {
            scored.addAll(uniformRound(r, 100, 1, true));
        }
        AccuracyReport a = AccuracyReport.of(rounds, scored, 40, RULE);
        assertEquals(3, a.modelRound());
        assertEquals(1, a.firstRound());
        assertEquals(0.9, a.picked().accuracy(), 1e-12);
        assertEquals(Wilson.of95(27, 30).lower(), a.picked().lower(), 1e-12);
        // The spot checks: the last pick of each round, all right.
        assertEquals(3, a.checked().labels());
        assertEquals(1.0, a.checked().accuracy(), 0);
        assertEquals(List.of(0.8, 0.9), a.agreements());
        assertEquals(3, a.perRound().size());
        assertTrue(a.perRound().get(0).weighted());
    }

    @Test
    void aRoundCountsUpToItsFirstPickWithoutALabel() {
        // Pick 4 of round 1 has no label yet: picks 5-10 cannot be weighed (LURE needs the sequence).
        List<AccuracyReport.Scored> scored = new ArrayList<>(uniformRound(1, 100, 0, false));
        AccuracyReport.Scored hole = scored.get(3);
        scored.set(3, new AccuracyReport.Scored(1, hole.order(), hole.probability(), false, null));
        AccuracyReport a = AccuracyReport.of(List.of(new AccuracyReport.Round(1, 10, 100, Double.NaN)), scored, 10,
                RULE);
        assertEquals(3, a.picked().labels());
    }

    @Test
    void greedyPicksAreNeverReweighed() {
        // The b best by score were certain picks (q = 1): LURE cannot use them; the spot check still counts.
        List<AccuracyReport.Scored> scored = new ArrayList<>();
        for (int m = 1; m <= 9; m++) {
            scored.add(new AccuracyReport.Scored(1, m, 1.0, false, false));
        }
        scored.add(new AccuracyReport.Scored(1, 10, 1.0 / 91, true, true));
        AccuracyReport a = AccuracyReport.of(List.of(new AccuracyReport.Round(1, 10, 100, Double.NaN)), scored, 10,
                RULE);
        assertFalse(a.picked().known());
        assertEquals(1, a.checked().labels());
        assertEquals(a.checked(), a.best());
        assertFalse(a.perRound().get(0).weighted());
    }

    @Test
    void weightedPicksMatchLureByHand() {
        // Two picks of 4 candidates: q = 0.7 (right) then 0.5 (wrong).
        // v_1 = 1 + (4-2)/(4-1) (1/(4 * 0.7) - 1) = 0.571429; v_2 = 1 + (2/2)(1/(3 * 0.5) - 1) = 0.666667;
        // accuracy = 1 - (v_2 * 1) / 2 = 0.666667.
        List<AccuracyReport.Scored> scored = List.of(new AccuracyReport.Scored(1, 1, 0.7, false, true),
                new AccuracyReport.Scored(1, 2, 0.5, false, false));
        AccuracyReport a = AccuracyReport.of(List.of(new AccuracyReport.Round(1, 5, 4, Double.NaN)), scored, 7, RULE);
        double[] v = Lure.weights(new double[] {0.7, 0.5}, 4);
        assertEquals(1 + 2.0 / 3 * (1 / 2.8 - 1), v[0], 1e-12);
        assertEquals(1 - v[1] / 2, a.picked().accuracy(), 1e-12);
        assertEquals(2, a.picked().labels());
    }

    @Test
    void theWindowFollowsTheNewestModel() {
        // Rounds every 10 labels up to 300: the window starts at the first round whose model had at
        // least 200 labels (two thirds of 300).
        List<AccuracyReport.Round> rounds = new ArrayList<>();
        List<AccuracyReport.Scored> scored = new ArrayList<>();
        for (int r = 1; r <= 30; r++) {
            rounds.add(new AccuracyReport.Round(r, 10L * r, 1000, 0.95));
            scored.addAll(uniformRound(r, 1000, r < 15 ? 3 : 1, false));
        }
        AccuracyReport a = AccuracyReport.of(rounds, scored, 310, RULE);
        assertEquals(20, a.firstRound());
        assertEquals(110, a.picked().labels());
        assertEquals(0.9, a.picked().accuracy(), 1e-12);
        assertNotNull(a.curve());
        // The card: predictions still shift (0.95 < 0.99); the curve is fitted to the rounds' own estimates.
        assertTrue(List.of(StopAdvice.State.PAYING, StopAdvice.State.SLOWING).contains(a.advice().state()), a.advice().toString());
    }

    @Test
    void nothingScoredYet() {
        AccuracyReport a = AccuracyReport.of(List.of(), List.of(), 0, RULE);
        AccuracyEstimate none = a.best();
        assertFalse(none.known());
        assertEquals(StopAdvice.State.START, a.advice().state());
    }
}
