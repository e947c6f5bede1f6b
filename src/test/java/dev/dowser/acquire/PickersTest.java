package dev.dowser.acquire;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.HashSet;
import java.util.Set;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** The batch pickers against their definitions and the published BatchBALD example. */
class PickersTest {

    /** Binary draws p(y = 1) = 0.1 and 0.9 for one record, as probs[(i * S + s) * C + k]. */
    static float[] opposedPair(int copies) {
        float[] p = new float[copies * 2 * 2];
        for (int i = 0; i < copies; i++) {
            int o = i * 4;
            p[o] = 0.9f;
            p[o + 1] = 0.1f;
            p[o + 2] = 0.1f;
            p[o + 3] = 0.9f;
        }
        return p;
    }

    @Test
    void topBAgreesWithAFullSortIncludingTies() {
        SplittableRandom rng = new SplittableRandom(9);
        for (int t = 0; t < 200; t++) {
            double[] scores = new double[1 + rng.nextInt(300)];
            for (int i = 0; i < scores.length; i++) {
                scores[i] = rng.nextInt(20);
            }
            int b = 1 + rng.nextInt(320);
            Integer[] order = new Integer[scores.length];
            for (int i = 0; i < order.length; i++) {
                order[i] = i;
            }
            Arrays.sort(order, (x, y) -> scores[y] != scores[x] ? Double.compare(scores[y], scores[x])
                    : Integer.compare(x, y));
            int[] expected = Arrays.stream(order).limit(b).mapToInt(Integer::intValue).toArray();
            assertArrayEquals(expected, Pickers.topB(scores, b), "scores " + Arrays.toString(scores) + ", b " + b);
        }
    }

    @Test
    void aBatchOfNoneIsEmpty() {
        // A mixed batch whose typical picks fill it asks power sampling for none (this threw before).
        double[] scores = {0.3, 0.1, 0.2};
        assertArrayEquals(new int[0], Pickers.topB(scores, 0));
        assertEquals(0, Pickers.power(scores, 0, 1.0, new SplittableRandom(1)).size());
    }

    @Test
    void batchBaldOfOneIsBald() {
        SplittableRandom rng = new SplittableRandom(1);
        int n = 12;
        int s = 6;
        int c = 3;
        float[] p = randomProbabilities(rng, n, s, c);
        BatchBald bb = new BatchBald(p, n, s, c);
        double[] bald = new double[n];
        for (int i = 0; i < n; i++) {
            bald[i] = Scores.bald(Arrays.copyOfRange(p, i * s * c, (i + 1) * s * c), s, c);
            assertEquals(bald[i], bb.jointMutualInformation(i), 1e-9);
        }
        assertArrayEquals(Pickers.topB(bald, 1), bb.pick(1, rng));
    }

    @Test
    void aDuplicateAddsLittle() {
        // Kirsch et al. (2019): labels independent given w, so for the record of the BALD example
        // taken twice, I(y1, y2; w) = H(y1, y2) - 2 E H = 1.164540 - 0.650166 = 0.514375 nats,
        // less than twice its BALD (0.736128).
        BatchBald bb = new BatchBald(opposedPair(2), 2, 2, 2);
        assertEquals(0.514375, bb.jointMutualInformation(0, 1), 1e-6);
        assertEquals(0.736128, 2 * bb.jointMutualInformation(0), 1e-6);
    }

    /**
     * The joint information of a batch cannot exceed the entropy of the weights, log S for S draws
     * (Kirsch et al. 2019 discuss this): with too few draws every further gain is near zero and a
     * copy can win. 128 draws leave room for ten records' worth.
     */
    @Test
    void batchBaldAvoidsRepeatsWhereTopBTakesThem() {
        SplittableRandom rng = new SplittableRandom(2);
        int distinct = 12;
        int s = 128;
        int c = 3;
        float[] base = randomProbabilities(rng, distinct, s, c);
        float[] p = new float[3 * base.length];
        for (int copy = 0; copy < 3; copy++) {
            System.arraycopy(base, 0, p, copy * base.length, base.length);
        }
        int n = 3 * distinct;
        double[] bald = new double[n];
        for (int i = 0; i < n; i++) {
            bald[i] = Scores.bald(Arrays.copyOfRange(p, i * s * c, (i + 1) * s * c), s, c);
        }
        int[] top = Pickers.topB(bald, 10);
        assertTrue(distinctRecords(top, distinct) < 10, "top-b should take copies: " + Arrays.toString(top));
        int[] batch = new BatchBald(p, n, s, c).pick(10, rng);
        assertEquals(10, distinctRecords(batch, distinct), "BatchBALD took a copy: " + Arrays.toString(batch));
    }

    @Test
    void sampledJointEntropyAgreesWithTheExactOne() {
        SplittableRandom rng = new SplittableRandom(3);
        int n = 8;
        int s = 10;
        int c = 3;
        float[] p = randomProbabilities(rng, n, s, c);
        int[] exact = new BatchBald(p, n, s, c, 1_000_000, 0).pick(5, new SplittableRandom(4));
        // An exact limit this small switches to sampling after the first pick.
        int[] sampled = new BatchBald(p, n, s, c, 9, 20_000).pick(5, new SplittableRandom(4));
        assertEquals(exact[0], sampled[0]);
        assertEquals(new HashSet<>(Arrays.asList(box(exact))).size(), 5);
        assertEquals(5, new HashSet<>(Arrays.asList(box(sampled))).size());
        int overlap = 0;
        Set<Integer> e = new HashSet<>(Arrays.asList(box(exact)));
        for (int i : sampled) {
            overlap += e.contains(i) ? 1 : 0;
        }
        assertTrue(overlap >= 4, "sampled and exact batches differ too much: " + Arrays.toString(exact) + " vs "
                + Arrays.toString(sampled));
    }

    /**
     * The first record power sampling picks follows score^beta / sum: a chi-square test over 20,000
     * trials, against 16.27, the 0.1% point of chi-square with 3 degrees of freedom (any table).
     */
    @Test
    void powerSamplingPicksInProportionToScoreToTheBeta() {
        double[] scores = {0.5, 1, 2, 4};
        for (double beta : new double[] {1, 2}) {
            SplittableRandom rng = new SplittableRandom(5);
            int trials = 20_000;
            int[] first = new int[4];
            for (int t = 0; t < trials; t++) {
                first[Pickers.power(scores, 2, beta, rng).positions()[0]]++;
            }
            double total = 0;
            for (double v : scores) {
                total += Math.pow(v, beta);
            }
            double chi2 = 0;
            for (int i = 0; i < 4; i++) {
                double expected = trials * Math.pow(scores[i], beta) / total;
                chi2 += (first[i] - expected) * (first[i] - expected) / expected;
            }
            assertTrue(chi2 < 16.27, "beta " + beta + ": chi-square " + chi2 + " for " + Arrays.toString(first));
        }
    }

    /**
     * Power sampling reports each pick's probability given the picks before it, which is
     * Plackett-Luce for Gumbel-top-k (Kool, van Hoof & Welling 2019): the ordered pairs (i, j) of
     * 2-pick batches occur with frequency q_i q_j, q_i = w_i / W and q_j = w_j / (W - w_i). A
     * chi-square test over the 12 ordered pairs of 4 candidates against 31.26, the 0.1% point of
     * chi-square with 11 degrees of freedom (Commons Math below). A score of 0 comes only after every
     * positive one, uniformly among the zeros.
     */
    @Test
    void powerSamplingReportsPlackettLuceProbabilities() {
        assertEquals(31.264, new org.apache.commons.math3.distribution.ChiSquaredDistribution(11)
                .inverseCumulativeProbability(0.999), 1e-3);
        double[] scores = {0.5, 1, 2, 4};
        double total = 7.5;
        SplittableRandom rng = new SplittableRandom(8);
        int trials = 30_000;
        int[][] pairs = new int[4][4];
        for (int t = 0; t < trials; t++) {
            Picks p = Pickers.power(scores, 2, 1.0, rng);
            int i = p.positions()[0];
            int j = p.positions()[1];
            pairs[i][j]++;
            assertEquals(scores[i] / total, p.probabilities()[0], 1e-12);
            assertEquals(scores[j] / (total - scores[i]), p.probabilities()[1], 1e-12);
        }
        double chi2 = 0;
        for (int i = 0; i < 4; i++) {
            for (int j = 0; j < 4; j++) {
                if (i != j) {
                    double expected = trials * scores[i] / total * scores[j] / (total - scores[i]);
                    chi2 += (pairs[i][j] - expected) * (pairs[i][j] - expected) / expected;
                }
            }
        }
        assertTrue(chi2 < 31.26, "chi-square " + chi2);
        Picks withZeros = Pickers.power(new double[] {0, 3, 0, 1}, 4, 1.0, rng);
        assertEquals(List.of(1, 3), List.of(withZeros.positions()[0], withZeros.positions()[1]).stream().sorted().toList());
        assertEquals(0.5, withZeros.probabilities()[2], 1e-12, "the first of two zeros, uniformly");
        assertEquals(1.0, withZeros.probabilities()[3], 1e-12);
    }

    /**
     * With a uniform share e the first pick follows (1 - e) score / sum + e / n, a record scored 0
     * included, and each pick's reported probability is that weight over what is left: a
     * chi-square test over 20,000 trials against 16.27, the 0.1% point with 3 degrees of freedom.
     */
    @Test
    void powerSamplingWithAUniformShareIsTheDefensiveMixture() {
        double[] scores = {0, 1, 2, 5};
        double e = 0.4;
        double[] w = new double[4];
        for (int i = 0; i < 4; i++) {
            w[i] = (1 - e) * scores[i] / 8 + e / 4;
        }
        SplittableRandom rng = new SplittableRandom(12);
        int trials = 20_000;
        int[] first = new int[4];
        for (int t = 0; t < trials; t++) {
            Picks p = Pickers.power(scores, 2, 1.0, e, rng);
            int i = p.positions()[0];
            int j = p.positions()[1];
            first[i]++;
            assertEquals(w[i], p.probabilities()[0], 1e-12);
            assertEquals(w[j] / (1 - w[i]), p.probabilities()[1], 1e-12);
        }
        double chi2 = 0;
        for (int i = 0; i < 4; i++) {
            double expected = trials * w[i];
            chi2 += (first[i] - expected) * (first[i] - expected) / expected;
        }
        assertTrue(chi2 < 16.27, "chi-square " + chi2 + " for " + Arrays.toString(first));
    }

    @Test
    void kmeansPlusPlusSamplesBySquaredDistance() {
        // Points 0, 1 and 10 on a line: after 0, D^2 is 0, 1, 100, so 10 comes next with
        // probability 100/101 (Arthur & Vassilvitskii 2007, the D^2 weighting).
        float[] x = {0, 1, 10};
        SplittableRandom rng = new SplittableRandom(6);
        int afterZero = 0;
        int tenNext = 0;
        for (int t = 0; t < 30_000; t++) {
            int[] picked = ColdStart.kmeansPlusPlus(x, 3, 1, 2, rng);
            if (picked[0] == 0) {
                afterZero++;
                tenNext += picked[1] == 2 ? 1 : 0;
            }
        }
        double share = (double) tenNext / afterZero;
        double sd = Math.sqrt(100.0 / 101 * (1.0 / 101) / afterZero);
        assertEquals(100.0 / 101, share, 5 * sd);
    }

    @Test
    void kmeansPlusPlusCoversSeparatedClusters() {
        SplittableRandom rng = new SplittableRandom(7);
        int clusters = 5;
        int per = 40;
        float[] x = new float[clusters * per * 2];
        for (int k = 0; k < clusters; k++) {
            for (int i = 0; i < per; i++) {
                int r = k * per + i;
                x[r * 2] = (float) (100 * k + rng.nextGaussian());
                x[r * 2 + 1] = (float) rng.nextGaussian();
            }
        }
        int[] picked = ColdStart.kmeansPlusPlus(x, clusters * per, 2, clusters, rng);
        Set<Integer> seen = new HashSet<>();
        for (int r : picked) {
            seen.add(r / per);
        }
        assertEquals(clusters, seen.size(), "k-means++ left a cluster out: " + Arrays.toString(picked));
    }

    static int distinctRecords(int[] batch, int distinct) {
        Set<Integer> s = new HashSet<>();
        for (int i : batch) {
            s.add(i % distinct);
        }
        return s.size();
    }

    static Integer[] box(int[] a) {
        return Arrays.stream(a).boxed().toArray(Integer[]::new);
    }

    /** Draws that disagree: each a random, fairly confident distribution. */
    static float[] randomProbabilities(SplittableRandom rng, int n, int s, int c) {
        float[] p = new float[n * s * c];
        for (int i = 0; i < n * s; i++) {
            double sum = 0;
            for (int k = 0; k < c; k++) {
                p[i * c + k] = (float) Math.pow(rng.nextDouble(), 4);
                sum += p[i * c + k];
            }
            for (int k = 0; k < c; k++) {
                p[i * c + k] /= sum;
            }
        }
        return p;
    }
}
