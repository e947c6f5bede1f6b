package dev.dowser.sampler;

import dev.dowser.model.Layout;
import dev.dowser.model.Mlp;
import java.util.List;

/** The posterior predictive: class probabilities averaged over draws, p(y | x) = mean_s p(y | x, theta_s). */
public final class Predictive {

    static final int BLOCK_ROWS = 512;

    private Predictive() {
    }

    /** Mean probabilities of {@code rows} rows of x over the draws, row-major (rows x classes). */
    public static float[] meanProbabilities(Layout layout, List<float[]> draws, float[] x, int rows) {
        int c = layout.architecture().classes();
        int block = Math.max(1, Math.min(BLOCK_ROWS, rows));
        Mlp mlp = new Mlp(layout, block);
        double[] sum = new double[rows * c];
        float[] p = new float[block * c];
        for (float[] theta : draws) {
            for (int start = 0; start < rows; start += block) {
                int n = Math.min(block, rows - start);
                mlp.probabilities(theta, x, start, n, p);
                for (int i = 0; i < n * c; i++) {
                    sum[start * c + i] += p[i];
                }
            }
        }
        float[] out = new float[rows * c];
        for (int i = 0; i < out.length; i++) {
            out[i] = (float) (sum[i] / draws.size());
        }
        return out;
    }
}
