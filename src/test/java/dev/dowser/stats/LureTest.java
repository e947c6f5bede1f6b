package dev.dowser.stats;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * LURE against the properties Farquhar, Gal & Rainforth (2021) prove for it: unbiased for the
 * pool's mean loss under any proposal with q > 0 (their Theorem 1), the plain mean under uniform
 * picks, and exact when every record is picked.
 */
class LureTest {

    /** A pool of 40 records: a 0-1 loss that the proposal favours (errors sit where picks go), as in active learning. */
    private static final int N = 40;
    private static final int M = 10;

    private static double[] poolLosses() {
        double[] loss = new double[N];
        for (int i = 0; i < N; i++) {
            loss[i] = i % 4 == 0 || i >= 34 ? 1 : 0;
        }
        return loss;
    }

    /** Proposal weights rising with the index: records 34-39 are about 20 times likelier than record 0. */
    private static double[] proposalWeights() {
        double[] w = new double[N];
        for (int i = 0; i < N; i++) {
            w[i] = Math.exp(3.0 * i / N);
        }
        return w;
    }

    /** One pick sequence by Plackett-Luce (sequential draws without replacement in proportion to w), drawn directly. */
    private static int[] pick(double[] w, int m, double[] q, SplittableRandom rng) {
        boolean[] taken = new boolean[w.length];
        int[] picks = new int[m];
        for (int k = 0; k < m; k++) {
            double left = 0;
            for (int i = 0; i < w.length; i++) {
                left += taken[i] ? 0 : w[i];
            }
            double u = rng.nextDouble() * left;
            int chosen = -1;
            for (int i = 0; i < w.length && chosen < 0; i++) {
                if (!taken[i]) {
                    u -= w[i];
                    if (u < 0) {
                        chosen = i;
                    }
                }
            }
            if (chosen < 0) {
                // u fell on the last boundary through rounding: the last free record.
                for (int i = w.length - 1; chosen < 0; i--) {
                    chosen = taken[i] ? -1 : i;
                }
            }
            taken[chosen] = true;
            picks[k] = chosen;
            q[k] = w[chosen] / left;
        }
        return picks;
    }

    @Test
    void unbiasedOverManyPickSequencesWhereThePlainMeanIsNot() {
        double[] loss = poolLosses();
        double[] w = proposalWeights();
        double truth = 0;
        for (double l : loss) {
            truth += l / N;
        }
        SplittableRandom rng = new SplittableRandom(12);
        int trials = 40_000;
        double sum = 0;
        double sumSq = 0;
        double plain = 0;
        int covered = 0;
        for (int t = 0; t < trials; t++) {
            double[] q = new double[M];
            int[] picks = pick(w, M, q, rng);
            double[] l = new double[M];
            double naive = 0;
            for (int k = 0; k < M; k++) {
                l[k] = loss[picks[k]];
                naive += l[k] / M;
            }
            double[] v = Lure.weights(q, N);
            double r = Lure.risk(l, v);
            sum += r;
            sumSq += r * r;
            plain += naive;
            double[] right = new double[M];
            for (int k = 0; k < M; k++) {
                right[k] = 1 - l[k];
            }
            AccuracyEstimate interval = AccuracyEstimate.weighted(right, v);
            covered += 1 - truth >= interval.lower() && 1 - truth <= interval.upper() ? 1 : 0;
        }
        double mean = sum / trials;
        double se = Math.sqrt((sumSq / trials - mean * mean) / trials);
        // Unbiased: the mean estimate lies within 3 standard errors of the truth (0.3% two-sided by chance).
        assertEquals(truth, mean, 3 * se, "LURE mean " + mean + " against " + truth + ", se " + se);
        // The plain mean of the picks' losses is biased upward here, by far more than the noise.
        assertTrue(plain / trials - truth > 20 * se, "plain mean " + plain / trials + " against " + truth);
        // The estimate's 95% interval (AccuracyEstimate.weighted) covers the truth in at least 90% of sequences.
        assertTrue(covered >= 0.90 * trials, "covered " + covered + " of " + trials);
    }

    @Test
    void aContinuousLossIsEstimatedWithoutBiasToo() {
        double[] w = proposalWeights();
        double[] loss = new double[N];
        double truth = 0;
        for (int i = 0; i < N; i++) {
            loss[i] = 0.1 + Math.sin(i) * Math.sin(i) * (i / 10.0);
            truth += loss[i] / N;
        }
        SplittableRandom rng = new SplittableRandom(13);
        int trials = 40_000;
        double sum = 0;
        double sumSq = 0;
        for (int t = 0; t < trials; t++) {
            double[] q = new double[M];
            int[] picks = pick(w, M, q, rng);
            double[] l = new double[M];
            for (int k = 0; k < M; k++) {
                l[k] = loss[picks[k]];
            }
            double r = Lure.risk(l, Lure.weights(q, N));
            sum += r;
            sumSq += r * r;
        }
        double mean = sum / trials;
        double se = Math.sqrt((sumSq / trials - mean * mean) / trials);
        assertEquals(truth, mean, 3 * se);
    }

    @Test
    void uniformPicksGiveThePlainMean() {
        // q(i_m) = 1 / (N - m + 1): every v_m = 1 (Farquhar et al. 2021, section 3).
        double[] q = new double[M];
        for (int k = 0; k < M; k++) {
            q[k] = 1.0 / (N - k);
        }
        double[] v = Lure.weights(q, N);
        double[] ones = new double[M];
        java.util.Arrays.fill(ones, 1);
        assertArrayEquals(ones, v, 1e-12);
        double[] l = {1, 0, 0, 1, 0, 0, 0, 1, 0, 0};
        assertEquals(0.3, Lure.risk(l, v), 1e-12);
    }

    @Test
    void picksCoveringThePoolGiveItsMeanExactly() {
        // M = N: (N - M) = 0, so v_m = 1 whatever q was, and the estimate is the pool's own mean.
        double[] q = {0.5, 0.9, 0.2, 1};
        double[] v = Lure.weights(q, 4);
        assertEquals(0.25 * (0.3 + 0.6 + 0.1 + 1.0), Lure.risk(new double[] {0.3, 0.6, 0.1, 1.0}, v), 1e-12);
    }

    @Test
    void aWorkedWeight() {
        // N = 10, M = 3, the second pick had q = 0.5 among the 9 left:
        // v_2 = 1 + (10 - 3)/(10 - 2) * (1/(9 * 0.5) - 1) = 1 + 0.875 * (-0.77778) = 0.31944.
        double[] v = Lure.weights(new double[] {0.1, 0.5, 0.125}, 10);
        assertEquals(1 + 7.0 / 8 * (1 / 4.5 - 1), v[1], 1e-12);
        assertEquals(0.319444444, v[1], 1e-8);
        // The first pick at uniform odds (1/10) weighs 1; the third at 1/8 among 8 left also weighs 1.
        assertEquals(1, v[0], 1e-12);
        assertEquals(1, v[2], 1e-12);
    }

    @Test
    void refusesImpossibleProbabilities() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Lure.weights(new double[] {0.5, 0}, 10));
        assertEquals("pick 2 has probability 0.0; it must lie in (0, 1]", e.getMessage());
        assertEquals("3 picks from a pool of 2",
                assertThrows(IllegalArgumentException.class, () -> Lure.weights(new double[3], 2)).getMessage());
    }
}
