package dev.dowser.acquire;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.dowser.model.Activation;
import dev.dowser.model.Architecture;
import dev.dowser.model.Layout;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** The fused pool scorer against a plain reference: double precision, one row and one draw at a time, no fusion. */
class PoolScorerTest {

    /** Class probabilities of one row under one draw, straight from the layout's definition. */
    static double[] reference(Layout layout, float[] theta, float[] x, int row) {
        Architecture a = layout.architecture();
        double[] h = new double[a.inputs()];
        for (int i = 0; i < h.length; i++) {
            h[i] = x[row * a.inputs() + i];
        }
        for (int l = 0; l < a.layers(); l++) {
            double[] z = new double[a.fanOut(l)];
            for (int j = 0; j < z.length; j++) {
                double v = theta[layout.biasOffset(l) + j];
                for (int i = 0; i < h.length; i++) {
                    v += h[i] * theta[layout.weightOffset(l) + i * z.length + j];
                }
                z[j] = l == a.layers() - 1 ? v : a.activation() == Activation.RELU ? Math.max(0, v) : Math.tanh(v);
            }
            h = z;
        }
        double max = Double.NEGATIVE_INFINITY;
        for (double v : h) {
            max = Math.max(max, v);
        }
        double sum = 0;
        for (double v : h) {
            sum += Math.exp(v - max);
        }
        double[] p = new double[h.length];
        for (int c = 0; c < h.length; c++) {
            p[c] = Math.exp(h[c] - max) / sum;
        }
        return p;
    }

    private void check(Architecture arch, int rows, int draws, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        Layout layout = new Layout(arch);
        float[] x = new float[rows * arch.inputs()];
        for (int i = 0; i < x.length; i++) {
            x[i] = (float) rng.nextGaussian();
        }
        List<float[]> ds = new ArrayList<>();
        for (int k = 0; k < draws; k++) {
            float[] theta = new float[layout.dimension()];
            for (int i = 0; i < theta.length; i++) {
                theta[i] = (float) (rng.nextGaussian() * 0.8);
            }
            ds.add(theta);
        }
        PoolScorer.Result r;
        try (PoolScorer scorer = new PoolScorer(2, 7)) {
            // Block size 7 and, below, more draws than one group: every edge of the blocking is crossed.
            r = scorer.score(layout, ds, x, rows);
        }
        int c = arch.classes();
        for (int row = 0; row < rows; row++) {
            float[] p = new float[draws * c];
            for (int k = 0; k < draws; k++) {
                double[] q = reference(layout, ds.get(k), x, row);
                for (int j = 0; j < c; j++) {
                    p[k * c + j] = (float) q[j];
                }
            }
            assertEquals(Scores.bald(p, draws, c), r.bald()[row], 1e-5, "BALD of row " + row);
            assertEquals(Scores.predictiveEntropy(p, draws, c), r.entropy()[row], 1e-5, "entropy of row " + row);
            assertEquals(Scores.variationRatio(p, draws, c), r.variationRatio()[row], 1e-9, "variation ratio of row " + row);
            double[] mean = Scores.mean(p, draws, c);
            for (int j = 0; j < c; j++) {
                assertEquals(mean[j], r.meanProbabilities()[row * c + j], 1e-5);
            }
        }
    }

    @Test
    void oneHiddenLayer() {
        check(new Architecture(6, List.of(9), 4, Activation.RELU), 45, 5, 1);
    }

    @Test
    void moreDrawsThanOneGroup() {
        check(new Architecture(4, List.of(5), 3, Activation.RELU), 20, PoolScorer.GROUP_DRAWS + 5, 4);
    }

    @Test
    void deeperAndTanh() {
        check(new Architecture(5, List.of(7, 6), 3, Activation.TANH), 30, 4, 2);
        check(new Architecture(3, List.of(4, 5, 6), 2, Activation.RELU), 23, 3, 3);
    }
}
