package dev.dowser.acquire;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;

/**
 * BatchBALD (Kirsch, van Amersfoort & Gal 2019): grows a batch greedily, each time adding the
 * candidate that most raises the joint mutual information
 * I(y_1..y_b; w) = H(y_1..y_b) - sum_i E_w H(y_i | w),
 * the second term by the labels' independence given the weights. The joint entropy is exact while
 * the configurations of the batch so far, times the classes, number at most {@code exactLimit};
 * beyond, it is estimated from {@code samples} configurations drawn from the joint (the paper's
 * section 4.1): H ~= -1/M sum_m sum_y p(y | c_m) log p(c_m, y) with p(c_m) from the same draws.
 *
 * <p>Probabilities are {@code probs[(i * draws + s) * classes + k]} for candidate i and draw s.
 */
public final class BatchBald {

    public static final int DEFAULT_EXACT_LIMIT = 4_096;
    public static final int DEFAULT_SAMPLES = 2_000;
    public static final int MAX_BATCH = 20;

    private final float[] probs;
    private final int candidates;
    private final int draws;
    private final int classes;
    private final int exactLimit;
    private final int samples;

    public BatchBald(float[] probs, int candidates, int draws, int classes, int exactLimit, int samples) {
        if (probs.length != (long) candidates * draws * classes) {
            throw new IllegalArgumentException("probabilities hold " + probs.length + " values, expected "
                    + candidates + " x " + draws + " x " + classes);
        }
        this.probs = probs;
        this.candidates = candidates;
        this.draws = draws;
        this.classes = classes;
        this.exactLimit = exactLimit;
        this.samples = samples;
    }

    public BatchBald(float[] probs, int candidates, int draws, int classes) {
        this(probs, candidates, draws, classes, DEFAULT_EXACT_LIMIT, DEFAULT_SAMPLES);
    }

    private float p(int i, int s, int k) {
        return probs[(i * draws + s) * classes + k];
    }

    /** E_w H(y_i | w): the mean over draws of candidate i's entropy. */
    double expectedEntropy(int i) {
        double h = 0;
        for (int s = 0; s < draws; s++) {
            h += Scores.entropy(probs, (i * draws + s) * classes, classes);
        }
        return h / draws;
    }

    /**
     * For each configuration c of the batch so far, P_s(c) = prod_i p_s(y_i = c_i): rows are
     * configurations, columns draws. Exact: every configuration; sampled: M drawn ones, each with
     * a weight 1/M in place of its probability mass.
     */
    private record Configurations(double[][] perDraw, double[] weight, boolean sampled) {
    }

    /** The joint mutual information of the given candidates, exactly (for small sets and tests). */
    public double jointMutualInformation(int... batch) {
        Configurations c = exact(batch);
        double sumExpected = 0;
        for (int i : batch) {
            sumExpected += expectedEntropy(i);
        }
        return jointEntropy(c) - sumExpected;
    }

    /** Greedy BatchBALD: a batch of b candidates, in the order they were added. */
    public int[] pick(int b, SplittableRandom rng) {
        if (b < 1 || b > MAX_BATCH) {
            throw new IllegalArgumentException("BatchBALD takes batches of 1 to " + MAX_BATCH + ", got " + b);
        }
        int n = Math.min(b, candidates);
        List<Integer> chosen = new ArrayList<>();
        boolean[] used = new boolean[candidates];
        double sumExpected = 0;
        double[] expected = new double[candidates];
        for (int i = 0; i < candidates; i++) {
            expected[i] = expectedEntropy(i);
        }
        Configurations configs = new Configurations(new double[][] {ones()}, new double[] {1}, false);
        for (int step = 0; step < n; step++) {
            int best = -1;
            double bestGain = Double.NEGATIVE_INFINITY;
            ByDraw view = byDraw(configs);
            double[] joint = new double[classes * view.count()];
            for (int i = 0; i < candidates; i++) {
                if (used[i]) {
                    continue;
                }
                double mi = jointEntropyWith(configs, view, i, joint) - sumExpected - expected[i];
                if (mi > bestGain) {
                    bestGain = mi;
                    best = i;
                }
            }
            used[best] = true;
            chosen.add(best);
            sumExpected += expected[best];
            configs = extend(configs, best, rng);
        }
        return chosen.stream().mapToInt(Integer::intValue).toArray();
    }

    private double[] ones() {
        double[] v = new double[draws];
        java.util.Arrays.fill(v, 1);
        return v;
    }

    /** Every configuration of the given candidates. */
    private Configurations exact(int[] batch) {
        Configurations c = new Configurations(new double[][] {ones()}, new double[] {1}, false);
        for (int i : batch) {
            c = product(c, i);
        }
        return c;
    }

    /** The configurations extended by candidate i: exactly, or sampled when they grow too many. */
    private Configurations extend(Configurations c, int i, SplittableRandom rng) {
        if (!c.sampled() && (long) c.perDraw().length * classes * classes <= exactLimit) {
            return product(c, i);
        }
        if (!c.sampled()) {
            c = sample(c, rng);
        }
        // Each sampled configuration takes one label for i, drawn from p(y_i | c) by picking a draw
        // with weight P_s(c) and then y ~ p_s(y_i).
        double[][] next = new double[c.perDraw().length][];
        for (int m = 0; m < next.length; m++) {
            double[] row = c.perDraw()[m];
            int s = pickDraw(row, rng);
            int y = pickClass(i, s, rng);
            next[m] = new double[draws];
            for (int t = 0; t < draws; t++) {
                next[m][t] = row[t] * p(i, t, y);
            }
        }
        return new Configurations(next, c.weight(), true);
    }

    private Configurations product(Configurations c, int i) {
        double[][] rows = c.perDraw();
        double[][] next = new double[rows.length * classes][];
        double[] weight = new double[rows.length * classes];
        for (int r = 0; r < rows.length; r++) {
            for (int k = 0; k < classes; k++) {
                double[] v = new double[draws];
                for (int s = 0; s < draws; s++) {
                    v[s] = rows[r][s] * p(i, s, k);
                }
                next[r * classes + k] = v;
                weight[r * classes + k] = 1;
            }
        }
        return new Configurations(next, weight, false);
    }

    /** Replaces exact configurations by samples drawn from the joint they describe. */
    private Configurations sample(Configurations c, SplittableRandom rng) {
        double[][] rows = c.perDraw();
        double[] mass = new double[rows.length];
        double total = 0;
        for (int r = 0; r < rows.length; r++) {
            mass[r] = mean(rows[r]);
            total += mass[r];
        }
        double[][] drawn = new double[samples][];
        double[] weight = new double[samples];
        for (int m = 0; m < samples; m++) {
            double u = rng.nextDouble() * total;
            int r = 0;
            while (r < rows.length - 1 && (u -= mass[r]) > 0) {
                r++;
            }
            drawn[m] = rows[r];
            weight[m] = 1.0 / samples;
        }
        return new Configurations(drawn, weight, true);
    }

    private int pickDraw(double[] row, SplittableRandom rng) {
        double total = 0;
        for (double v : row) {
            total += v;
        }
        double u = rng.nextDouble() * total;
        for (int s = 0; s < draws - 1; s++) {
            u -= row[s];
            if (u <= 0) {
                return s;
            }
        }
        return draws - 1;
    }

    private int pickClass(int i, int s, SplittableRandom rng) {
        double u = rng.nextDouble();
        for (int k = 0; k < classes - 1; k++) {
            u -= p(i, s, k);
            if (u <= 0) {
                return k;
            }
        }
        return classes - 1;
    }

    private static double mean(double[] v) {
        double s = 0;
        for (double x : v) {
            s += x;
        }
        return s / v.length;
    }

    /** H over the configurations themselves. */
    private double jointEntropy(Configurations c) {
        double h = 0;
        for (double[] row : c.perDraw()) {
            double q = mean(row);
            if (q > 0) {
                h -= q * Math.log(q);
            }
        }
        return h;
    }

    /**
     * The configurations laid out by draw, {@code t[s * count + r] = P_s(c_r)}, with each one's
     * mean over the draws: the candidates' loop reads them once per step, along configurations.
     */
    private record ByDraw(double[] t, double[] mass, int count) {
    }

    private ByDraw byDraw(Configurations c) {
        double[][] rows = c.perDraw();
        int count = rows.length;
        double[] t = new double[draws * count];
        double[] mass = new double[count];
        for (int r = 0; r < count; r++) {
            for (int s = 0; s < draws; s++) {
                t[s * count + r] = rows[r][s];
            }
            mass[r] = mean(rows[r]);
        }
        return new ByDraw(t, mass, count);
    }

    /**
     * H(y_batch, y_i): exact sum over configurations, or the sampled estimate. p(c, y) = 1/S sum_s
     * P_s(c) p_s(y) is summed over the draws in order, in loops along the configurations, which the
     * JIT vectorises: the sums are those of a loop over draws per configuration, bit for bit, at
     * about a third of its cost (measured: the speed notes); {@code joint} is work space.
     */
    private double jointEntropyWith(Configurations c, ByDraw v, int i, double[] joint) {
        int count = v.count();
        double[] t = v.t();
        java.util.Arrays.fill(joint, 0, classes * count, 0);
        int s = 0;
        // Four draws a pass, added one after the other as a loop over draws adds them: a quarter of the stores.
        for (; s + 4 <= draws; s += 4) {
            for (int k = 0; k < classes; k++) {
                double q0 = p(i, s, k);
                double q1 = p(i, s + 1, k);
                double q2 = p(i, s + 2, k);
                double q3 = p(i, s + 3, k);
                int o = k * count;
                int b0 = s * count;
                for (int r = 0; r < count; r++) {
                    joint[o + r] = joint[o + r] + t[b0 + r] * q0 + t[b0 + count + r] * q1
                            + t[b0 + 2 * count + r] * q2 + t[b0 + 3 * count + r] * q3;
                }
            }
        }
        for (; s < draws; s++) {
            for (int k = 0; k < classes; k++) {
                double q = p(i, s, k);
                int o = k * count;
                int b = s * count;
                for (int r = 0; r < count; r++) {
                    joint[o + r] += t[b + r] * q;
                }
            }
        }
        double h = 0;
        for (int r = 0; r < count; r++) {
            double pc = v.mass()[r];
            if (pc <= 0) {
                continue;
            }
            for (int k = 0; k < classes; k++) {
                double pcy = joint[k * count + r] / draws;
                if (pcy <= 0) {
                    continue;
                }
                // Exact: -sum p(c, y) log p(c, y). Sampled: c ~ p(c), so weight p(c, y) / p(c) / M.
                h -= c.sampled() ? c.weight()[r] * pcy / pc * Math.log(pcy) : pcy * Math.log(pcy);
            }
        }
        return h;
    }
}
