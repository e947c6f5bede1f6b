package dev.dowser.rounds;

import dev.dowser.acquire.BatchBald;
import dev.dowser.acquire.Pickers;
import dev.dowser.acquire.Picks;
import dev.dowser.acquire.PoolScorer;
import dev.dowser.acquire.TypiClust;
import dev.dowser.blas.RowMajor;
import dev.dowser.data.LabelledSet;
import dev.dowser.model.Layout;
import dev.dowser.sampler.Predictive;
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
     * The batch among the candidates, with each pick's probability. {@code scores} are the
     * candidates' scores and {@code cx} their features (row-major), which BatchBALD needs for each
     * draw's probabilities and TypiClust, with the labelled records {@code known}, clusters.
     */
    static Picks pick(Strategy strategy, int b, PoolScorer.Result scores, float[] cx, LabelledSet known, Layout layout,
                      List<float[]> draws, SplittableRandom rng) {
        return switch (strategy) {
            case TYPICLUST_POWER -> TypiClust.lowBudget(known.rows(), known.classes().size())
                    ? Picks.greedy(TypiClust.nextBatch(known.x(), known.rows(), cx, scores.bald().length, known.cols(), b,
                    rng))
                    : Pickers.power(scores.bald(), b, POWER_BETA, rng);
            case TYPICLUST_MIX -> TypiClust.mixed(TypiClust.nextBatch(known.x(), known.rows(), cx, scores.bald().length,
                    known.cols(), b, rng), scores, b, POWER_BETA, rng);
            case BALD -> Picks.greedy(Pickers.topB(scores.bald(), b));
            case ENTROPY -> Picks.greedy(Pickers.topB(scores.entropy(), b));
            case MARGIN -> Picks.greedy(Pickers.topB(scores.margin(), b));
            case POWER -> Pickers.power(scores.bald(), b, POWER_BETA, rng);
            case RANDOM -> Pickers.uniform(scores.bald().length, b, rng);
            case BATCHBALD -> Picks.greedy(batchBald(b, scores, cx, layout, draws, rng));
        };
    }

    private static int[] batchBald(int b, PoolScorer.Result scores, float[] cx, Layout layout, List<float[]> draws,
                                   SplittableRandom rng) {
        int[] shortlist = Pickers.topB(scores.bald(), Math.min(scores.bald().length, b * BATCHBALD_CANDIDATES_PER_SLOT));
        float[] rows = RowMajor.gather(cx, layout.architecture().inputs(), shortlist);
        float[] probs = Predictive.perDraw(layout, draws, rows, shortlist.length);
        int[] picked = new BatchBald(probs, shortlist.length, draws.size(), layout.architecture().classes())
                .pick(b, rng);
        int[] out = new int[picked.length];
        for (int i = 0; i < picked.length; i++) {
            out[i] = shortlist[picked[i]];
        }
        return out;
    }
}
