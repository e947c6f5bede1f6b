package dev.dowser.acquire;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.dowser.TestSupport;
import dev.dowser.model.Activation;
import dev.dowser.model.Architecture;
import dev.dowser.model.Layout;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** The fused pool scorer against a plain reference: double precision, one row and one draw at a time, no fusion. */
class PoolScorerTest {

    /** Class probabilities of one row under one draw, from the plain double reference network. */
    static double[] reference(Layout layout, float[] theta, float[] x, int row) {
        double[] t = new double[theta.length];
        for (int i = 0; i < t.length; i++) {
            t[i] = theta[i];
        }
        double[] p = TestSupport.referenceLogProbabilities(layout, t, x, row);
        for (int c = 0; c < p.length; c++) {
            p[c] = Math.exp(p[c]);
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
            assertEquals(Scores.margin(p, draws, c), r.margin()[row], 1e-5, "margin of row " + row);
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
    void noHiddenLayer() {
        check(new Architecture(6, List.of(), 5, Activation.RELU), 19, 6, 5);
    }

    @Test
    void deeperAndTanh() {
        check(new Architecture(5, List.of(7, 6), 3, Activation.TANH), 30, 4, 2);
        check(new Architecture(3, List.of(4, 5, 6), 2, Activation.RELU), 23, 3, 3);
    }
}
