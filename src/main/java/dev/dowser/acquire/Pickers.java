package dev.dowser.acquire;

import dev.dowser.stats.RandomVariates;
import java.util.SplittableRandom;

/** Batch pickers that work from one score per candidate. */
public final class Pickers {

    private Pickers() {
    }

    /** Batches up to this size are selected in one pass over the scores instead of a full sort. */
    static final int SMALL_BATCH = 64;

    /** The b highest scores, best first; ties keep the lower index first. */
    public static int[] topB(double[] scores, int b) {
        if (b <= 0) {
            return new int[0];
        }
        if (b <= SMALL_BATCH) {
            return topSmall(scores, Math.min(b, scores.length));
        }
        return topByHeap(scores, b);
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

    /**
     * The best b through a heap of the b best so far, worst on top: n log b steps and no boxing,
     * where sorting every index cost n log n on boxed integers.
     */
    private static int[] topByHeap(double[] scores, int b) {
        int n = Math.min(b, scores.length);
        int[] heap = new int[n];
        int size = 0;
        for (int i = 0; i < scores.length; i++) {
            if (size < n) {
                heap[size] = i;
                siftUp(heap, size++, scores);
            } else if (better(i, heap[0], scores)) {
                heap[0] = i;
                siftDown(heap, 0, n, scores);
            }
        }
        int[] out = new int[n];
        for (int last = n - 1; last >= 0; last--) {
            out[last] = heap[0];
            heap[0] = heap[last];
            siftDown(heap, 0, last, scores);
        }
        return out;
    }

    /** a ranks ahead of c: a higher score, or an equal one at an earlier index. */
    private static boolean better(int a, int c, double[] scores) {
        int cmp = Double.compare(scores[a], scores[c]);
        return cmp > 0 || (cmp == 0 && a < c);
    }

    private static void siftUp(int[] heap, int at, double[] scores) {
        while (at > 0) {
            int parent = (at - 1) / 2;
            if (!better(heap[parent], heap[at], scores)) {
                return;
            }
            swap(heap, parent, at);
            at = parent;
        }
    }

    private static void siftDown(int[] heap, int at, int size, double[] scores) {
        while (true) {
            int worst = at;
            for (int child = 2 * at + 1; child <= 2 * at + 2 && child < size; child++) {
                if (better(heap[worst], heap[child], scores)) {
                    worst = child;
                }
            }
            if (worst == at) {
                return;
            }
            swap(heap, at, worst);
            at = worst;
        }
    }

    private static void swap(int[] heap, int i, int j) {
        int t = heap[i];
        heap[i] = heap[j];
        heap[j] = t;
    }

    /**
     * Stochastic power sampling (Kirsch, Farquhar, Atighehchian, Jesson, Branchaud-Charron & Gal
     * 2023, "Stochastic Batch Acquisition: A Simple Baseline for Deep Active Learning"): the top b
     * of log(score) + Gumbel(0, 1/beta) noise, which draws b records without replacement with
     * probabilities proportional to w = score^beta. This is Gumbel-top-k, so the order of the picks
     * follows Plackett-Luce (Kool, van Hoof & Welling 2019, "Stochastic Beams and Where to Find
     * Them", section 3): the m-th pick i_m had probability w_{i_m} / (W - sum_{j<m} w_{i_j}), with W
     * the sum of every candidate's weight. Records scored 0 are picked only when no other remains,
     * then uniformly among themselves.
     */
    public static Picks power(double[] scores, int b, double beta, SplittableRandom rng) {
        return power(scores, b, beta, 0, rng);
    }

    /**
     * Power sampling from the defensive mixture (Hesterberg 1995, "Weighted average importance
     * sampling and defensive mixture distributions"): w_i = (1 - e) score_i^beta / sum_j score_j^beta
     * + e / n, so every record's probability is at least e / n and an importance weight 1 / (n q)
     * at most 1 / e. {@code uniformShare} e = 0 is plain power sampling.
     */
    public static Picks power(double[] scores, int b, double beta, double uniformShare, SplittableRandom rng) {
        if (!(beta > 0)) {
            throw new IllegalArgumentException("beta must be positive, got " + beta);
        }
        if (!(uniformShare >= 0 && uniformShare <= 1)) {
            throw new IllegalArgumentException("the uniform share must lie between 0 and 1, got " + uniformShare);
        }
        int n = scores.length;
        double[] weight = new double[n];
        double maxLog = Double.NEGATIVE_INFINITY;
        for (double s : scores) {
            if (s > 0) {
                maxLog = Math.max(maxLog, beta * Math.log(s));
            }
        }
        // Weights relative to the largest, so score^beta neither overflows nor underflows to all zeros.
        double sum = 0;
        for (int i = 0; i < n; i++) {
            weight[i] = scores[i] > 0 ? Math.exp(beta * Math.log(scores[i]) - maxLog) : 0;
            sum += weight[i];
        }
        double total = 0;
        int positive = 0;
        double[] perturbed = new double[n];
        for (int i = 0; i < n; i++) {
            if (sum > 0) {
                weight[i] = (1 - uniformShare) * weight[i] / sum + uniformShare / n;
            } else {
                weight[i] = uniformShare / n;
            }
            total += weight[i];
            // Gumbel(0, 1) = -log(-log U); 1 - U keeps U away from 0.
            double gumbel = -Math.log(-Math.log(1 - rng.nextDouble()));
            if (weight[i] > 0) {
                perturbed[i] = Math.log(weight[i]) + gumbel;
                positive++;
            } else {
                perturbed[i] = Double.NEGATIVE_INFINITY;
            }
        }
        int k = Math.min(b, n);
        int fromWeights = Math.min(k, positive);
        int[] top = topB(perturbed, fromWeights);
        int[] out = new int[k];
        double[] q = new double[k];
        double left = total;
        for (int m = 0; m < fromWeights; m++) {
            out[m] = top[m];
            q[m] = weight[top[m]] / left;
            left -= weight[top[m]];
        }
        if (fromWeights < k) {
            Picks rest = uniformAmong(zeroScored(weight), k - fromWeights, rng);
            System.arraycopy(rest.positions(), 0, out, fromWeights, rest.size());
            System.arraycopy(rest.probabilities(), 0, q, fromWeights, rest.size());
        }
        return new Picks(out, q);
    }

    /** b of n candidates uniformly at random without replacement; the m-th had probability 1 / (n - m). */
    public static Picks uniform(int n, int b, SplittableRandom rng) {
        int[] all = new int[n];
        for (int i = 0; i < n; i++) {
            all[i] = i;
        }
        return uniformAmong(all, b, rng);
    }

    /** A uniform ordered sample of {@code among}, each pick with the probability it was drawn with. */
    private static Picks uniformAmong(int[] among, int b, SplittableRandom rng) {
        int[] picks = RandomVariates.sample(among, b, rng);
        double[] q = new double[picks.length];
        for (int m = 0; m < picks.length; m++) {
            q[m] = 1.0 / (among.length - m);
        }
        return new Picks(picks, q);
    }

    private static int[] zeroScored(double[] scores) {
        return java.util.stream.IntStream.range(0, scores.length).filter(i -> !(scores[i] > 0)).toArray();
    }
}
