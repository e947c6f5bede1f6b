package dev.dowser.acquire;

import dev.dowser.stats.RandomVariates;
import dev.dowser.words.Worded;
import java.util.Arrays;
import java.util.SplittableRandom;

/**
 * The first batch of a pool with no labels, two ways.
 *
 * <p>k-means++ seeding (Arthur & Vassilvitskii 2007, "k-means++: The Advantages of Careful
 * Seeding"): the first record uniformly, each next one with probability proportional to D(x)^2,
 * its squared distance to the nearest record already picked. It spreads the batch, and so favours
 * outlying records.
 *
 * <p>TypiClust (Hacohen, Dekel & Weinshall 2022, "Active Learning on a Budget: Opposite Strategies
 * Suit High and Low Budgets", section 3.2): cluster the pool into b clusters by k-means and take
 * from each the most typical record, the one whose k nearest neighbours in its cluster are closest:
 * Typicality(x) = 1 / (mean distance to its k nearest neighbours), k = 20. The batch covers the
 * dense regions, where most records (and most of the test set) lie.
 */
public final class ColdStart {

    /** Which way a cold start picks. */
    public enum Method implements Worded {
        KMEANS_PLUS_PLUS,
        TYPICLUST;

        @Override
        public String word() {
            return this == KMEANS_PLUS_PLUS ? "kmeans++" : "typiclust";
        }

        public static Method parse(String word) {
            return Worded.parse(Method.class, word, "cold start");
        }
    }

    /** Clusters smaller than this are outliers, not regions worth a label (the paper's minimum). */
    static final int MIN_CLUSTER = 5;
    /** Neighbours that typicality averages over (the paper's k). */
    static final int NEIGHBOURS = 20;
    /** Records of a cluster whose typicality is computed, and that they are measured against, at most. */
    static final int TYPICALITY_SAMPLE = 1_000;

    private ColdStart() {
    }

    /** Rows of x (rows x cols, row-major) to label first, in the order picked. */
    public static int[] pick(Method method, float[] x, int rows, int cols, int b, SplittableRandom rng) {
        return method == Method.TYPICLUST ? typiClust(x, rows, cols, b, rng) : kmeansPlusPlus(x, rows, cols, b, rng);
    }

    public static int[] kmeansPlusPlus(float[] x, int rows, int cols, int b, SplittableRandom rng) {
        int n = Math.min(b, rows);
        int[] picked = new int[n];
        double[] d2 = new double[rows];
        Arrays.fill(d2, Double.POSITIVE_INFINITY);
        picked[0] = rng.nextInt(rows);
        for (int j = 1; j <= n; j++) {
            int last = picked[j - 1];
            double total = 0;
            for (int i = 0; i < rows; i++) {
                d2[i] = Math.min(d2[i], squaredDistance(x, cols, i, last));
                total += d2[i];
            }
            if (j == n) {
                break;
            }
            if (total <= 0) {
                // Every record coincides with a picked one: fall back to uniform among the rest.
                picked[j] = rng.nextInt(rows);
                continue;
            }
            double u = rng.nextDouble() * total;
            int choice = rows - 1;
            for (int i = 0; i < rows; i++) {
                u -= d2[i];
                if (u < 0) {
                    choice = i;
                    break;
                }
            }
            picked[j] = choice;
        }
        return picked;
    }

    /**
     * TypiClust's first batch: the most typical record of each of b clusters, largest cluster first.
     * Clusters of fewer than {@link #MIN_CLUSTER} records (a handful of outliers) are passed over, as
     * in the paper; their places go to the next most typical records of the largest clusters.
     */
    public static int[] typiClust(float[] x, int rows, int cols, int b, SplittableRandom rng) {
        int n = Math.min(b, rows);
        int[] cluster = KMeans.cluster(x, rows, cols, n, rng);
        int[][] members = KMeans.members(cluster, n);
        Integer[] order = new Integer[n];
        for (int k = 0; k < n; k++) {
            order[k] = k;
        }
        Arrays.sort(order, (a, c) -> Integer.compare(members[c].length, members[a].length));
        int[] picked = new int[n];
        int at = 0;
        boolean[] taken = new boolean[rows];
        // First one from each cluster large enough, then, round after round, one more from each.
        for (int pass = 0; at < n && pass < rows; pass++) {
            boolean any = false;
            for (int k : order) {
                if (at == n) {
                    break;
                }
                if (members[k].length < Math.min(MIN_CLUSTER, rows) && pass == 0 && members[order[0]].length
                        >= MIN_CLUSTER) {
                    continue;
                }
                int[] left = Arrays.stream(members[k]).filter(r -> !taken[r]).toArray();
                if (left.length == 0) {
                    continue;
                }
                int best = mostTypical(x, cols, left, rng);
                picked[at++] = best;
                taken[best] = true;
                any = true;
            }
            if (!any && at < n) {
                // Only duplicates remain unpicked: take them in order.
                for (int r = 0; r < rows && at < n; r++) {
                    if (!taken[r]) {
                        taken[r] = true;
                        picked[at++] = r;
                    }
                }
            }
        }
        return picked;
    }

    /**
     * The member with the highest typicality. Past {@link #TYPICALITY_SAMPLE} members, a uniform
     * sample of that many is scored, against the same sample, so a cluster costs at most a million
     * distances.
     */
    static int mostTypical(float[] x, int cols, int[] members, SplittableRandom rng) {
        int[] pool = members;
        if (members.length > TYPICALITY_SAMPLE) {
            pool = RandomVariates.sample(members, TYPICALITY_SAMPLE, rng);
        }
        int k = Math.min(NEIGHBOURS, pool.length - 1);
        if (k < 1) {
            return pool[0];
        }
        int best = pool[0];
        double bestMean = Double.POSITIVE_INFINITY;
        double[] d = new double[pool.length];
        for (int i = 0; i < pool.length; i++) {
            for (int j = 0; j < pool.length; j++) {
                d[j] = i == j ? Double.POSITIVE_INFINITY : Math.sqrt(squaredDistance(x, cols, pool[i], pool[j]));
            }
            double mean = meanOfSmallest(d, k);
            // Typicality is 1 / mean distance: the smallest mean wins.
            if (mean < bestMean) {
                bestMean = mean;
                best = pool[i];
            }
        }
        return best;
    }

    /** The mean of the k smallest values (partially sorts {@code d}). */
    private static double meanOfSmallest(double[] d, int k) {
        Arrays.sort(d);
        double s = 0;
        for (int i = 0; i < k; i++) {
            s += d[i];
        }
        return s / k;
    }

    static double squaredDistance(float[] x, int cols, int a, int b) {
        double d = 0;
        int oa = a * cols;
        int ob = b * cols;
        for (int c = 0; c < cols; c++) {
            double diff = x[oa + c] - x[ob + c];
            d += diff * diff;
        }
        return d;
    }
}
