package dev.dowser.cli;

import dev.dowser.blas.Blas;
import dev.dowser.sampler.KernelChoice;
import dev.dowser.sampler.PosteriorSampler;
import dev.dowser.sampler.RoundDraws;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.stats.SeedTree;
import java.io.PrintWriter;
import java.util.List;
import java.util.SplittableRandom;

/** The sampler's benchmarks, run by {@code dowser bench}. */
final class SamplerBench {

    static final int INPUTS = 64;
    static final int HIDDEN = 128;
    static final int CLASSES = 10;
    static final int ROWS = 1_000;
    static final int BATCH = 128;
    static final int CHAINS = 4;
    static final int MEASURED_ROUNDS = 3;

    private SamplerBench() {
    }

    /** Best of three square products C = A B of size n through the model's BLAS, in GFLOP/s. */
    static double sgemmGflops(int n) {
        SplittableRandom rng = new SplittableRandom(1);
        float[] a = new float[n * n];
        float[] b = new float[n * n];
        float[] c = new float[n * n];
        for (int i = 0; i < a.length; i++) {
            a[i] = (float) rng.nextGaussian();
            b[i] = (float) rng.nextGaussian();
        }
        double best = 0;
        for (int rep = 0; rep < 4; rep++) {
            long t0 = System.nanoTime();
            Blas.matmul(n, n, n, a, b, c);
            double s = (System.nanoTime() - t0) / 1e9;
            if (rep > 0) {
                best = Math.max(best, 2.0 * n * n * n / s / 1e9);
            }
        }
        return best;
    }

    /** Multiply-adds of one step: forward, weight gradients, and the hidden layer's delta. */
    static double flopsPerStep() {
        double forward = 2.0 * BATCH * (INPUTS * HIDDEN + HIDDEN * CLASSES);
        double weightGrads = forward;
        double hiddenDelta = 2.0 * BATCH * HIDDEN * CLASSES;
        return forward + weightGrads + hiddenDelta;
    }

    static void run(PrintWriter out, double sgemmGflops, boolean quick) {
        SplittableRandom rng = new SplittableRandom(2);
        float[] x = new float[ROWS * INPUTS];
        int[] y = new int[ROWS];
        for (int i = 0; i < ROWS; i++) {
            y[i] = rng.nextInt(CLASSES);
            for (int j = 0; j < INPUTS; j++) {
                x[i * INPUTS + j] = (float) (rng.nextGaussian() + (j % CLASSES == y[i] ? 1 : 0));
            }
        }
        int steps = quick ? 500 : 3_000;
        SamplerConfig config = SamplerConfig.builder().kernel(KernelChoice.PSGLD).hidden(List.of(HIDDEN))
                .chains(CHAINS, CHAINS * 10).burnInSteps(steps).reburnInSteps(300).thinSteps(20).build();
        PosteriorSampler sampler = new PosteriorSampler(config);
        // A warm-up round for the JIT, then three measured cold rounds: the median is reported, with
        // the range, since other work on a shared machine moves single runs by about 10%.
        sampler.sample(x, y, CLASSES, null, new float[0], SeedTree.of(0));
        double[] rates = new double[MEASURED_ROUNDS];
        RoundDraws cold = null;
        for (int r = 0; r < MEASURED_ROUNDS; r++) {
            cold = sampler.sample(x, y, CLASSES, null, new float[0], SeedTree.of(1 + r));
            rates[r] = cold.chainSteps() / cold.seconds();
        }
        java.util.Arrays.sort(rates);
        double stepsPerSecond = rates[MEASURED_ROUNDS / 2];
        out.printf("sgld_steps_per_s=%.0f%nsgld_steps_per_s_min=%.0f%nsgld_steps_per_s_max=%.0f%n", stepsPerSecond,
                rates[0], rates[MEASURED_ROUNDS - 1]);
        out.printf("sgld_gflops=%.1f%n", stepsPerSecond * flopsPerStep() / 1e9);
        if (sgemmGflops > 0) {
            out.printf("sgld_fraction_of_sgemm=%.3f%n", stepsPerSecond * flopsPerStep() / 1e9 / sgemmGflops);
        }
        RoundDraws warm = sampler.sample(x, y, CLASSES, cold.lastStates(), new float[0], SeedTree.of(1 + MEASURED_ROUNDS));
        out.printf("round_sampling_seconds=%.3f%n", warm.seconds());
        out.printf("round_sampling_chain_steps=%d%n", warm.chainSteps());
    }
}
