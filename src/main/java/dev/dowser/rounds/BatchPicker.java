package dev.dowser.rounds;

import dev.dowser.acquire.BatchBald;
import dev.dowser.acquire.Pickers;
import dev.dowser.acquire.PoolScorer;
import dev.dowser.model.Layout;
import dev.dowser.model.Mlp;
import java.util.List;
import java.util.SplittableRandom;

/** Picks a batch from scored candidates by a strategy. */
final class BatchPicker {

    /** BatchBALD considers the best BALD candidates only: this many per batch slot (common practice). */
    static final int BATCHBALD_CANDIDATES_PER_SLOT = 10;
    static final double POWER_BETA = 1.0;

    private BatchPicker() {
    }

    /**
     * Positions of the batch among the candidates. {@code scores} are the candidates' scores and
     * {@code cx} their features (row-major), which BatchBALD needs for each draw's probabilities.
     */
    static int[] pick(Strategy strategy, int b, PoolScorer.Result scores, float[] cx, Layout layout,
                      List<float[]> draws, SplittableRandom rng) {
        int n = scores.bald().length;
        return switch (strategy) {
            case BALD -> Pickers.topB(scores.bald(), b);
            case ENTROPY -> Pickers.topB(scores.entropy(), b);
            case POWER -> Pickers.power(scores.bald(), b, POWER_BETA, rng);
            case RANDOM -> {
                double[] u = new double[n];
                for (int i = 0; i < n; i++) {
                    u[i] = rng.nextDouble();
                }
                yield Pickers.topB(u, b);
            }
            case BATCHBALD -> batchBald(b, scores, cx, layout, draws, rng);
        };
    }

    private static int[] batchBald(int b, PoolScorer.Result scores, float[] cx, Layout layout, List<float[]> draws,
                                   SplittableRandom rng) {
        int[] shortlist = Pickers.topB(scores.bald(), Math.min(scores.bald().length, b * BATCHBALD_CANDIDATES_PER_SLOT));
        int d = layout.architecture().inputs();
        int c = layout.architecture().classes();
        int s = draws.size();
        float[] rows = new float[shortlist.length * d];
        for (int i = 0; i < shortlist.length; i++) {
            System.arraycopy(cx, shortlist[i] * d, rows, i * d, d);
        }
        float[] probs = new float[shortlist.length * s * c];
        Mlp mlp = new Mlp(layout, Math.max(1, shortlist.length));
        float[] p = new float[shortlist.length * c];
        for (int k = 0; k < s; k++) {
            mlp.probabilities(draws.get(k), rows, 0, shortlist.length, p);
            for (int i = 0; i < shortlist.length; i++) {
                System.arraycopy(p, i * c, probs, (i * s + k) * c, c);
            }
        }
        int[] picked = new BatchBald(probs, shortlist.length, s, c).pick(Math.min(b, BatchBald.MAX_BATCH), rng);
        int[] out = new int[picked.length];
        for (int i = 0; i < picked.length; i++) {
            out[i] = shortlist[picked[i]];
        }
        return out;
    }
}
