package dev.dowser.cli;

import dev.dowser.acquire.Pickers;
import dev.dowser.acquire.PoolScorer;
import dev.dowser.sampler.KernelChoice;
import dev.dowser.sampler.PosteriorSampler;
import dev.dowser.sampler.RoundDraws;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.stats.SeedTree;
import java.io.PrintWriter;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;

/**
 * A whole round, timed as the app runs it: continue the chains on 1000 labels (warm start), score
 * a 100,000-row pool with 64 draws, pick a batch of 10.
 */
final class RoundBench {

    static final int POOL = 100_000;
    static final int LABELLED = 1_000;
    static final int INPUTS = 64;
    static final int CLASSES = 10;

    private RoundBench() {
    }

    static void run(PrintWriter out, boolean quick) {
        int pool = quick ? POOL / 5 : POOL;
        SplittableRandom rng = new SplittableRandom(4);
        float[] x = new float[pool * INPUTS];
        int[] y = new int[LABELLED];
        for (int i = 0; i < pool; i++) {
            int k = rng.nextInt(CLASSES);
            if (i < LABELLED) {
                y[i] = k;
            }
            for (int j = 0; j < INPUTS; j++) {
                x[i * INPUTS + j] = (float) (rng.nextGaussian() + (j % CLASSES == k ? 1 : 0));
            }
        }
        float[] labelledX = Arrays.copyOf(x, LABELLED * INPUTS);
        SamplerConfig config = SamplerConfig.builder().kernel(KernelChoice.PSGLD).hidden(List.of(128)).build();
        PosteriorSampler sampler = new PosteriorSampler(config);
        RoundDraws previous = sampler.sample(labelledX, y, CLASSES, null, new float[0], SeedTree.of(0));
        try (PoolScorer scorer = PoolScorer.withAllCores()) {
            scorer.score(previous.layout(), previous.draws(), x, Math.min(pool, 10_000));
            long t0 = System.nanoTime();
            RoundDraws round = sampler.sample(labelledX, y, CLASSES, previous.lastStates(), new float[0], SeedTree.of(1));
            long t1 = System.nanoTime();
            PoolScorer.Result scores = scorer.score(round.layout(), round.draws(), x, pool);
            long t2 = System.nanoTime();
            int[] batch = Pickers.topB(scores.bald(), 10);
            long t3 = System.nanoTime();
            out.printf("round_pool_rows=%d%nround_labelled=%d%nround_draws=%d%nround_sample_seconds=%.3f%n"
                            + "round_score_seconds=%.3f%nround_pick_seconds=%.3f%nround_seconds=%.3f%n",
                    pool, LABELLED, round.draws().size(), (t1 - t0) / 1e9, (t2 - t1) / 1e9, (t3 - t2) / 1e9,
                    (t3 - t0) / 1e9);
            out.flush();
            if (batch.length != 10) {
                throw new IllegalStateException("the round picked " + batch.length + " records");
            }
        }
    }
}
