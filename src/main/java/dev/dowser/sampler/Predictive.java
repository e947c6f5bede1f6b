package dev.dowser.sampler;

import dev.dowser.model.Layout;
import dev.dowser.model.Mlp;
import java.util.List;

/** The posterior predictive: class probabilities averaged over draws, p(y | x) = mean_s p(y | x, theta_s). */
public final class Predictive {

    static final int BLOCK_ROWS = 512;

    private Predictive() {
    }

    /** Per row and class: the mean probability over draws and its standard deviation across them. */
    public record Belief(float[] mean, float[] sd, int classes) {
    }

    /** Mean probabilities of {@code rows} rows of x over the draws, row-major (rows x classes). */
    public static float[] meanProbabilities(Layout layout, List<float[]> draws, float[] x, int rows) {
        return belief(layout, draws, x, rows).mean();
    }

    /** The mean class probabilities of {@code rows} rows of x over the draws, with their spread across draws. */
    public static Belief belief(Layout layout, List<float[]> draws, float[] x, int rows) {
        int c = layout.architecture().classes();
        int block = Math.max(1, Math.min(BLOCK_ROWS, rows));
        Mlp mlp = new Mlp(layout, block);
        double[] sum = new double[rows * c];
        double[] sumSq = new double[rows * c];
        float[] p = new float[block * c];
        for (float[] theta : draws) {
            for (int start = 0; start < rows; start += block) {
                int n = Math.min(block, rows - start);
                mlp.probabilities(theta, x, start, n, p);
                for (int i = 0; i < n * c; i++) {
                    sum[start * c + i] += p[i];
                    sumSq[start * c + i] += (double) p[i] * p[i];
                }
            }
        }
        int s = draws.size();
        float[] mean = new float[rows * c];
        float[] sd = new float[rows * c];
        for (int i = 0; i < mean.length; i++) {
            double m = sum[i] / s;
            mean[i] = (float) m;
            // Population spread of the draws' probabilities; tiny negatives from rounding read as 0.
            sd[i] = (float) Math.sqrt(Math.max(0, sumSq[i] / s - m * m));
        }
        return new Belief(mean, sd, c);
    }

    /**
     * Each draw's class probabilities for {@code rows} rows of x: {@code out[(i * S + s) * C + k]}
     * for row i, draw s and class k, the layout the batch scores read.
     */
    public static float[] perDraw(Layout layout, List<float[]> draws, float[] x, int rows) {
        int c = layout.architecture().classes();
        int s = draws.size();
        Mlp mlp = new Mlp(layout, Math.max(1, Math.min(BLOCK_ROWS, rows)));
        float[] out = new float[rows * s * c];
        float[] p = new float[rows * c];
        for (int k = 0; k < s; k++) {
            mlp.probabilities(draws.get(k), x, 0, rows, p);
            for (int i = 0; i < rows; i++) {
                System.arraycopy(p, i * c, out, (i * s + k) * c, c);
            }
        }
        return out;
    }
}
