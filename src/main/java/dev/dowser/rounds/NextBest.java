package dev.dowser.rounds;

import dev.dowser.acquire.Pickers;
import dev.dowser.acquire.PoolScorer;
import dev.dowser.stats.RandomVariates;
import java.util.SplittableRandom;

/**
 * A round's reserve: the candidates it would have picked next, best first, queued after its batch
 * and served once the batch is taken, while the next round runs, so that nobody waits for it. They
 * are ranked by the score the strategy picks by (random order for the random strategy and for a
 * cold start, which has no scores yet).
 */
final class NextBest {

    /** A reserve holds at least this many records (when the pool has them) ... */
    static final int MIN_RESERVE = 1_000;
    /** ... and at least this many batches' worth: enough to cover a slow round of a busy team. */
    static final int RESERVE_BATCHES = 20;

    private NextBest() {
    }

    /** How many records a round with batch size {@code batch} keeps in reserve, of {@code left} candidates not queued. */
    static int size(int batch, int left) {
        return Math.max(0, Math.min(left, Math.max(MIN_RESERVE, RESERVE_BATCHES * batch)));
    }

    /** The per-candidate score {@code strategy} ranks by, or null when it picks at random. */
    static double[] scoreOf(Strategy strategy, PoolScorer.Result scores) {
        return switch (strategy) {
            case BALD, POWER, TYPICLUST_POWER, TYPICLUST_MIX, BATCHBALD -> scores.bald();
            case ENTROPY -> scores.entropy();
            case MARGIN -> scores.margin();
            case RANDOM -> null;
        };
    }

    /**
     * The {@code k} best candidates by {@code score} that are not {@code queued}, best first; in
     * random order when {@code score} is null.
     */
    static int[] ranked(double[] score, int n, int[] queued, int k, SplittableRandom rng) {
        if (k <= 0) {
            return new int[0];
        }
        boolean[] taken = new boolean[n];
        for (int q : queued) {
            taken[q] = true;
        }
        if (score == null) {
            int[] free = new int[n - queued.length];
            int at = 0;
            for (int i = 0; i < n; i++) {
                if (!taken[i]) {
                    free[at++] = i;
                }
            }
            return RandomVariates.sample(free, k, rng);
        }
        double[] masked = score.clone();
        for (int q : queued) {
            masked[q] = Double.NEGATIVE_INFINITY;
        }
        return Pickers.topB(masked, Math.min(k, n - queued.length));
    }
}
