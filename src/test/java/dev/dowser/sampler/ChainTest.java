package dev.dowser.sampler;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.model.Prior;
import java.util.List;
import java.util.SplittableRandom;
import dev.dowser.stats.SeedTree;
import org.junit.jupiter.api.Test;

/** Divergence recovery, reproducibility, and warm starts, on a small network and invented-free data. */
class ChainTest {

    /** Two Gaussian blobs in 3 dimensions (class 0 around -1, class 1 around +1): a toy with a clear answer. */
    static float[][] blobs(int n, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        float[] x = new float[n * 3];
        float[] y = new float[n];
        for (int i = 0; i < n; i++) {
            int k = i % 2;
            y[i] = k;
            for (int j = 0; j < 3; j++) {
                x[i * 3 + j] = (float) ((k == 0 ? -1 : 1) + 0.7 * rng.nextGaussian());
            }
        }
        return new float[][] {x, y};
    }

    static int[] ints(float[] y) {
        int[] out = new int[y.length];
        for (int i = 0; i < y.length; i++) {
            out[i] = (int) y[i];
        }
        return out;
    }

    static SamplerConfig small(long seed) {
        return SamplerConfig.builder().hidden(List.of(8)).chains(2, 8).burnInSteps(300).reburnInSteps(100)
                .thinSteps(10).kernel(KernelChoice.PSGLD).build();
    }

    @Test
    void aDivergingChainRecoversAndTheEventIsRecorded() {
        float[][] d = blobs(60, 1);
        // Plain SGLD with a learning rate this large multiplies the weights by about 14 a step,
        // so within a few dozen steps they overflow float; each halving brings it nearer stability.
        SamplerConfig config = small(7).toBuilder().kernel(KernelChoice.SGLD).learningRate(1e3).build();
        RoundDraws s = new PosteriorSampler(config).sample(d[0], ints(d[1]), 2, null, new float[0], SeedTree.of(0));
        assertFalse(s.divergences().isEmpty(), "no divergence was recorded");
        Divergence first = s.divergences().get(0);
        assertEquals("non-finite log density or gradient", first.reason());
        for (float[] draw : s.draws()) {
            for (float v : draw) {
                assertTrue(Float.isFinite(v));
            }
        }
        assertTrue(s.lastStates().get(0).stepSize() < 2 * 1e3 / 60, "the step size was not lowered");
        assertEquals(s.divergences().size(), s.health().divergences());
    }

    @Test
    void sameSeedSameDrawsBitForBit() {
        float[][] d = blobs(80, 2);
        RoundDraws a = new PosteriorSampler(small(11)).sample(d[0], ints(d[1]), 2, null, new float[0], SeedTree.of(11));
        RoundDraws b = new PosteriorSampler(small(11)).sample(d[0], ints(d[1]), 2, null, new float[0], SeedTree.of(11));
        assertEquals(a.draws().size(), b.draws().size());
        for (int i = 0; i < a.draws().size(); i++) {
            assertArrayEquals(a.draws().get(i), b.draws().get(i), 0f, "draw " + i);
        }
        RoundDraws c = new PosteriorSampler(small(12)).sample(d[0], ints(d[1]), 2, null, new float[0], SeedTree.of(12));
        assertFalse(java.util.Arrays.equals(a.draws().get(0), c.draws().get(0)));
    }

    @Test
    void aWarmStartContinuesFromTheLastStates() {
        float[][] d = blobs(80, 3);
        PosteriorSampler sampler = new PosteriorSampler(small(13));
        RoundDraws first = sampler.sample(d[0], ints(d[1]), 2, null, new float[0], SeedTree.of(0));
        RoundDraws second = sampler.sample(d[0], ints(d[1]), 2, first.lastStates(), new float[0], SeedTree.of(1));
        assertTrue(second.warmStart());
        long firstSteps = first.lastStates().get(0).step();
        assertEquals(firstSteps + 100 + 4 * 10, second.lastStates().get(0).step(),
                "the second round's steps continue the first's count: re-burn-in 100, then 4 draws x 10");
    }

    @Test
    void hierarchicalPriorResamplesLayerPrecisions() {
        float[][] d = blobs(60, 4);
        SamplerConfig config = small(5).toBuilder().prior(new Prior(3, 1, true, 2)).build();
        RoundDraws s = new PosteriorSampler(config).sample(d[0], ints(d[1]), 2, null, new float[0], SeedTree.of(0));
        double[] tau = s.lastStates().get(0).hyper();
        assertEquals(2, tau.length);
        double[] fixed = config.prior().initialPrecisions(s.layout());
        assertFalse(tau[0] == fixed[0] && tau[1] == fixed[1], "precisions never moved");
    }
}
