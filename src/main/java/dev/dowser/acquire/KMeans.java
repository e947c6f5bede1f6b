package dev.dowser.acquire;

import dev.dowser.blas.RowMajor;
import java.util.Arrays;
import java.util.SplittableRandom;

/**
 * k-means clustering by Lloyd's iterations (Lloyd 1982, "Least squares quantization in PCM")
 * from k-means++ seeds: assign each record to its nearest centre, move each centre to its
 * records' mean, until no record changes cluster or {@link #MAX_ITERATIONS} pass. Seeds are
 * greedy k-means++ (Arthur & Vassilvitskii 2007, section 6: of 2 + ln k candidates drawn by D^2,
 * keep the one that lowers the sum of squares most), since plain D^2 seeding often starts a centre
 * on an outlier and Lloyd's iterations do not move it away; the best of {@link #RESTARTS} runs
 * (least within-cluster sum of squares) is kept. Past
 * {@link #FIT_ROWS} records the centres are fitted on a uniform sample and every record assigned
 * at the end, which keeps a large pool's cold start to a second.
 */
final class KMeans {

    static final int MAX_ITERATIONS = 50;
    static final int FIT_ROWS = 20_000;
    static final int RESTARTS = 2;

    private KMeans() {
    }

    /** Each record's cluster, 0..k-1. */
    static int[] cluster(float[] x, int rows, int cols, int k, SplittableRandom rng) {
        int[] fit = sample(rows, Math.min(rows, FIT_ROWS), rng);
        float[] fx = RowMajor.gather(x, cols, fit);
        double[] best = null;
        double bestInertia = Double.POSITIVE_INFINITY;
        for (int restart = 0; restart < RESTARTS; restart++) {
            double[] centres = lloyd(fx, fit.length, cols, k, rng);
            int[] assign = new int[fit.length];
            Arrays.fill(assign, -1);
            assignAll(fx, fit.length, cols, centres, k, assign);
            double inertia = 0;
            for (int i = 0; i < fit.length; i++) {
                inertia += squaredDistance(fx, i, centres, assign[i], cols);
            }
            if (inertia < bestInertia) {
                bestInertia = inertia;
                best = centres;
            }
        }
        int[] all = new int[rows];
        Arrays.fill(all, -1);
        assignAll(x, rows, cols, best, k, all);
        return all;
    }

    /** Centres after Lloyd's iterations from one k-means++ seeding. */
    private static double[] lloyd(float[] fx, int n, int cols, int k, SplittableRandom rng) {
        int[] seeds = greedySeeds(fx, n, cols, k, rng);
        double[] centres = new double[k * cols];
        for (int c = 0; c < k; c++) {
            for (int j = 0; j < cols; j++) {
                centres[c * cols + j] = fx[seeds[c] * cols + j];
            }
        }
        int[] assign = new int[n];
        Arrays.fill(assign, -1);
        for (int it = 0; it < MAX_ITERATIONS; it++) {
            if (!assignAll(fx, n, cols, centres, k, assign)) {
                break;
            }
            double[] sum = new double[k * cols];
            int[] count = new int[k];
            for (int i = 0; i < n; i++) {
                int c = assign[i];
                count[c]++;
                for (int j = 0; j < cols; j++) {
                    sum[c * cols + j] += fx[i * cols + j];
                }
            }
            for (int c = 0; c < k; c++) {
                if (count[c] > 0) {
                    for (int j = 0; j < cols; j++) {
                        centres[c * cols + j] = sum[c * cols + j] / count[c];
                    }
                }
            }
        }
        return centres;
    }

    /** Greedy k-means++ seeding: each next seed the best of 2 + ln k candidates drawn by D^2. */
    static int[] greedySeeds(float[] x, int n, int cols, int k, SplittableRandom rng) {
        int tries = 2 + (int) Math.log(k);
        int[] seeds = new int[k];
        double[] d2 = new double[n];
        seeds[0] = rng.nextInt(n);
        for (int i = 0; i < n; i++) {
            d2[i] = ColdStart.squaredDistance(x, cols, i, seeds[0]);
        }
        double[] candidate = new double[n];
        double[] bestD2 = new double[n];
        for (int j = 1; j < k; j++) {
            double total = Arrays.stream(d2).sum();
            int best = -1;
            double bestPotential = Double.POSITIVE_INFINITY;
            for (int t = 0; t < tries; t++) {
                int c = total > 0 ? drawByWeight(d2, total, rng) : rng.nextInt(n);
                double potential = 0;
                for (int i = 0; i < n; i++) {
                    candidate[i] = Math.min(d2[i], ColdStart.squaredDistance(x, cols, i, c));
                    potential += candidate[i];
                }
                if (potential < bestPotential) {
                    bestPotential = potential;
                    best = c;
                    System.arraycopy(candidate, 0, bestD2, 0, n);
                }
            }
            seeds[j] = best;
            System.arraycopy(bestD2, 0, d2, 0, n);
        }
        return seeds;
    }

    private static int drawByWeight(double[] w, double total, SplittableRandom rng) {
        double u = rng.nextDouble() * total;
        for (int i = 0; i < w.length; i++) {
            u -= w[i];
            if (u < 0) {
                return i;
            }
        }
        return w.length - 1;
    }

    private static double squaredDistance(float[] x, int row, double[] centres, int c, int cols) {
        double d = 0;
        for (int j = 0; j < cols; j++) {
            double diff = x[row * cols + j] - centres[c * cols + j];
            d += diff * diff;
        }
        return d;
    }
    /** Assigns each row to its nearest centre; true when any assignment changed. */
    private static boolean assignAll(float[] x, int rows, int cols, double[] centres, int k, int[] assign) {
        boolean changed = false;
        for (int i = 0; i < rows; i++) {
            int best = 0;
            double bestD = Double.POSITIVE_INFINITY;
            for (int c = 0; c < k; c++) {
                double d = 0;
                for (int j = 0; j < cols; j++) {
                    double diff = x[i * cols + j] - centres[c * cols + j];
                    d += diff * diff;
                }
                if (d < bestD) {
                    bestD = d;
                    best = c;
                }
            }
            if (assign[i] != best) {
                assign[i] = best;
                changed = true;
            }
        }
        return changed;
    }

    /** The records of each cluster. */
    static int[][] members(int[] cluster, int k) {
        int[] count = new int[k];
        for (int c : cluster) {
            count[c]++;
        }
        int[][] out = new int[k][];
        for (int c = 0; c < k; c++) {
            out[c] = new int[count[c]];
        }
        int[] at = new int[k];
        for (int i = 0; i < cluster.length; i++) {
            out[cluster[i]][at[cluster[i]]++] = i;
        }
        return out;
    }

    /** m of n indices, uniformly without replacement, in increasing order (all of them when m = n). */
    private static int[] sample(int n, int m, SplittableRandom rng) {
        if (m == n) {
            int[] all = new int[n];
            for (int i = 0; i < n; i++) {
                all[i] = i;
            }
            return all;
        }
        int[] picks = Pickers.uniform(n, m, rng).positions();
        Arrays.sort(picks);
        return picks;
    }
}
