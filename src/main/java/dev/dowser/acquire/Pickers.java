package dev.dowser.acquire;

import java.util.Arrays;
import java.util.SplittableRandom;

/** Batch pickers that work from one score per candidate. */
public final class Pickers {

    private Pickers() {
    }

    /** Batches up to this size are selected in one pass over the scores instead of a full sort. */
    static final int SMALL_BATCH = 64;

    /** The b highest scores, best first; ties keep the lower index first. */
    public static int[] topB(double[] scores, int b) {
        if (b <= SMALL_BATCH) {
            return topSmall(scores, Math.min(b, scores.length));
        }
        return topBySorting(scores, b);
    }

    /** One pass keeping the best b so far in order; a record enters only if it beats the b-th. */
    private static int[] topSmall(double[] scores, int b) {
        int[] best = new int[b];
        int size = 0;
        for (int i = 0; i < scores.length; i++) {
            double v = scores[i];
            if (size == b && !(v > scores[best[b - 1]])) {
                continue;
            }
            int at = size < b ? size++ : b - 1;
            // Shift down past every kept record this one beats; equal scores keep the earlier index ahead.
            while (at > 0 && v > scores[best[at - 1]]) {
                best[at] = best[at - 1];
                at--;
            }
            best[at] = i;
        }
        return best;
    }

    private static int[] topBySorting(double[] scores, int b) {
        Integer[] order = new Integer[scores.length];
        for (int i = 0; i < order.length; i++) {
            order[i] = i;
        }
        Arrays.sort(order, (a, c) -> {
            int byScore = Double.compare(scores[c], scores[a]);
            return byScore != 0 ? byScore : Integer.compare(a, c);
        });
        int n = Math.min(b, scores.length);
        int[] out = new int[n];
        for (int i = 0; i < n; i++) {
            out[i] = order[i];
        }
        return out;
    }

    /**
     * Stochastic power sampling (Kirsch, Farquhar, Atighehchian, Jesson, Branchaud-Charron & Gal
     * 2023, "Stochastic Batch Acquisition: A Simple Baseline for Deep Active Learning"): the top b
     * of log(score) + Gumbel(0, 1/beta) noise, which draws b records without replacement with
     * probabilities proportional to score^beta. A score of 0 is never picked while others remain.
     */
    public static int[] power(double[] scores, int b, double beta, SplittableRandom rng) {
        if (!(beta > 0)) {
            throw new IllegalArgumentException("beta must be positive, got " + beta);
        }
        double[] perturbed = new double[scores.length];
        for (int i = 0; i < scores.length; i++) {
            // Gumbel(0, 1/beta) = -log(-log U) / beta; 1 - U keeps U away from 0.
            double u = 1 - rng.nextDouble();
            double gumbel = -Math.log(-Math.log(u)) / beta;
            perturbed[i] = scores[i] > 0 ? Math.log(scores[i]) + gumbel : Double.NEGATIVE_INFINITY;
        }
        return topB(perturbed, b);
    }
}
