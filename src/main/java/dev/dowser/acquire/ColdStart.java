package dev.dowser.acquire;

import java.util.SplittableRandom;

/**
 * The first batch of a pool with no labels: k-means++ seeding (Arthur & Vassilvitskii 2007,
 * "k-means++: The Advantages of Careful Seeding") in feature space, so the batch covers the pool:
 * the first record uniformly, each next one with probability proportional to D(x)^2, its squared
 * distance to the nearest record already picked.
 */
public final class ColdStart {

    private ColdStart() {
    }

    /** Rows of x (rows x cols, row-major) to label first, in the order picked. */
    public static int[] kmeansPlusPlus(float[] x, int rows, int cols, int b, SplittableRandom rng) {
        int n = Math.min(b, rows);
        int[] picked = new int[n];
        double[] d2 = new double[rows];
        java.util.Arrays.fill(d2, Double.POSITIVE_INFINITY);
        picked[0] = rng.nextInt(rows);
        for (int j = 1; j <= n; j++) {
            int last = picked[j - 1];
            double total = 0;
            for (int i = 0; i < rows; i++) {
                double d = 0;
                for (int c = 0; c < cols; c++) {
                    double diff = x[i * cols + c] - x[last * cols + c];
                    d += diff * diff;
                }
                d2[i] = Math.min(d2[i], d);
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
}
