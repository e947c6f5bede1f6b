package dev.dowser.sampler;

import dev.dowser.model.Activation;
import dev.dowser.model.Prior;
import java.util.List;

/**
 * Everything that decides how the posterior is sampled, validated here; an invalid value fails
 * with a message that says what to change.
 *
 * @param kernel         which kernel; AUTO picks MALA up to {@code malaMaxRows} labelled rows, else preconditioned SGLD
 * @param malaMaxRows    the largest labelled set for which AUTO picks full-batch MALA
 * @param hidden         hidden layer widths
 * @param activation     hidden nonlinearity
 * @param prior          the prior over weights
 * @param chains         chains run side by side
 * @param draws          draws kept in all, spread evenly over the chains
 * @param burnInSteps    steps before the first draw, for chains started from scratch
 * @param reburnInSteps  steps before the first draw, for chains continued from a previous round
 * @param thinSteps      steps between kept draws
 * @param batchRows      mini-batch size of the stochastic-gradient kernels
 * @param learningRate   eta; the step size is eps = 2 eta / N for N labelled rows, so a step moves
 *                       about eta times a per-row gradient (MALA adapts its step from there)
 * @param cycles         0 for a constant step, else cycles of the cyclical schedule (draws per chain)
 * @param temperature    1 samples the true posterior; below 1 sharpens it
 * @param seed           the seed every chain's generator is split from
 * @param threads        threads for the chains
 */
public record SamplerConfig(KernelChoice kernel, int malaMaxRows, List<Integer> hidden, Activation activation,
                            Prior prior, int chains, int draws, int burnInSteps, int reburnInSteps, int thinSteps,
                            int batchRows, double learningRate, int cycles, double temperature, long seed,
                            int threads) {

    /**
     * MALA's step costs N rows and its tuned step shrinks as N grows, so past a few hundred rows it
     * loses on both counts: measured on 64-128-10 with 4 chains and a warm round of 620 steps, MALA
     * took 0.72 s at 512 rows (worst R-hat 1.16) and 1.34 s at 1024 (R-hat 1.26), preconditioned
     * SGLD 0.24 s (1.04) and 0.27 s (1.08).
     */
    public static final int DEFAULT_MALA_MAX_ROWS = 512;
    public static final int DEFAULT_CHAINS = 4;
    public static final int DEFAULT_DRAWS = 64;
    public static final int DEFAULT_BURN_IN_STEPS = 2_000;
    public static final int DEFAULT_REBURN_IN_STEPS = 300;
    public static final int DEFAULT_THIN_STEPS = 20;
    public static final double DEFAULT_LEARNING_RATE = 3e-3;

    public SamplerConfig {
        if (kernel == null) {
            throw new IllegalArgumentException("kernel is required: auto, sgld, psgld or mala");
        }
        if (malaMaxRows < 0) {
            throw new IllegalArgumentException("malaMaxRows must be 0 or more, got " + malaMaxRows);
        }
        hidden = List.copyOf(hidden);
        if (chains < 1) {
            throw new IllegalArgumentException("at least one chain is needed, got " + chains);
        }
        if (draws < chains || draws % chains != 0) {
            throw new IllegalArgumentException("draws (" + draws + ") must be a positive multiple of chains ("
                    + chains + ") so every chain keeps the same number");
        }
        if (burnInSteps < 0 || reburnInSteps < 0) {
            throw new IllegalArgumentException("burn-in steps must be 0 or more");
        }
        if (thinSteps < 1) {
            throw new IllegalArgumentException("thinSteps must be at least 1, got " + thinSteps);
        }
        if (batchRows < 1) {
            throw new IllegalArgumentException("batchRows must be at least 1, got " + batchRows);
        }
        if (!(learningRate > 0) || Double.isInfinite(learningRate)) {
            throw new IllegalArgumentException("learningRate must be positive, got " + learningRate);
        }
        if (cycles < 0 || (cycles > 0 && cycles != draws / chains)) {
            throw new IllegalArgumentException("cycles must be 0 (constant step) or the draws per chain ("
                    + draws / chains + "), got " + cycles);
        }
        if (!(temperature > 0) || Double.isInfinite(temperature)) {
            throw new IllegalArgumentException("temperature must be positive, got " + temperature
                    + "; 1 samples the true posterior");
        }
        if (threads < 1) {
            throw new IllegalArgumentException("threads must be at least 1, got " + threads);
        }
    }

    public static SamplerConfig defaults(long seed) {
        return new SamplerConfig(KernelChoice.AUTO, DEFAULT_MALA_MAX_ROWS, List.of(128), Activation.RELU,
                Prior.standard(), DEFAULT_CHAINS, DEFAULT_DRAWS, DEFAULT_BURN_IN_STEPS, DEFAULT_REBURN_IN_STEPS,
                DEFAULT_THIN_STEPS, ChainConfig.DEFAULT_BATCH_ROWS, DEFAULT_LEARNING_RATE, 0, 1.0, seed,
                ChainSet.defaultThreads(DEFAULT_CHAINS));
    }

    public SamplerConfig withKernel(KernelChoice k) {
        return new SamplerConfig(k, malaMaxRows, hidden, activation, prior, chains, draws, burnInSteps,
                reburnInSteps, thinSteps, batchRows, learningRate, cycles, temperature, seed, threads);
    }

    public SamplerConfig withChains(int c, int d) {
        return new SamplerConfig(kernel, malaMaxRows, hidden, activation, prior, c, d, burnInSteps,
                reburnInSteps, thinSteps, batchRows, learningRate, cycles, temperature, seed,
                ChainSet.defaultThreads(c));
    }

    public SamplerConfig withHidden(List<Integer> h) {
        return new SamplerConfig(kernel, malaMaxRows, h, activation, prior, chains, draws, burnInSteps,
                reburnInSteps, thinSteps, batchRows, learningRate, cycles, temperature, seed, threads);
    }

    public SamplerConfig withSteps(int burnIn, int reburnIn, int thin) {
        return new SamplerConfig(kernel, malaMaxRows, hidden, activation, prior, chains, draws, burnIn, reburnIn,
                thin, batchRows, learningRate, cycles, temperature, seed, threads);
    }

    public SamplerConfig withPrior(Prior p) {
        return new SamplerConfig(kernel, malaMaxRows, hidden, activation, p, chains, draws, burnInSteps,
                reburnInSteps, thinSteps, batchRows, learningRate, cycles, temperature, seed, threads);
    }

    public SamplerConfig withLearningRate(double eta) {
        return new SamplerConfig(kernel, malaMaxRows, hidden, activation, prior, chains, draws, burnInSteps,
                reburnInSteps, thinSteps, batchRows, eta, cycles, temperature, seed, threads);
    }

    public SamplerConfig withSeed(long s) {
        return new SamplerConfig(kernel, malaMaxRows, hidden, activation, prior, chains, draws, burnInSteps,
                reburnInSteps, thinSteps, batchRows, learningRate, cycles, temperature, s, threads);
    }

    public SamplerConfig withThreads(int t) {
        return new SamplerConfig(kernel, malaMaxRows, hidden, activation, prior, chains, draws, burnInSteps,
                reburnInSteps, thinSteps, batchRows, learningRate, cycles, temperature, seed, t);
    }
}
