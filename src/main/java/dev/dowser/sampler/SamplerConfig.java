package dev.dowser.sampler;

import dev.dowser.model.Activation;
import dev.dowser.model.Architecture;
import dev.dowser.model.Prior;
import java.util.List;

/**
 * Everything that decides how the posterior is sampled, in four parts, each validated where it
 * is made, with a message that says what to change. Made with {@link #builder()} (every value
 * starts at its named default) or changed with {@link #toBuilder()}. Random numbers are not part
 * of it: they come from the caller's seed tree.
 *
 * @param kernel      which kernel, and when the automatic choice switches
 * @param network     the network's shape
 * @param prior       the prior over weights
 * @param chains      chains and draws
 * @param steps       how long and how fast each chain moves
 * @param temperature 1 samples the true posterior; below 1 sharpens it (p^(1/T))
 */
public record SamplerConfig(KernelRule kernel, Network network, Prior prior, Chains chains, Steps steps,
                            double temperature) {

    /**
     * MALA's step costs N rows and its tuned step shrinks as N grows, so past a few hundred rows it
     * loses on both counts: measured on 64-128-10 with 4 chains and a warm round of 620 steps, MALA
     * took 0.72 s at 512 rows (worst R-hat 1.16) and 1.34 s at 1024 (R-hat 1.26), preconditioned
     * SGLD 0.24 s (1.04) and 0.27 s (1.08).
     */
    public static final int DEFAULT_MALA_MAX_ROWS = 512;
    /** The kernel's word, for the command line's default; the builder's kernel follows from it. */
    public static final String DEFAULT_KERNEL_WORD = "auto";
    /** The hidden nonlinearity's word, likewise. */
    public static final String DEFAULT_ACTIVATION_WORD = "relu";
    public static final int DEFAULT_CHAINS = 4;
    public static final int DEFAULT_DRAWS = 64;
    public static final int DEFAULT_BURN_IN_STEPS = 2_000;
    public static final int DEFAULT_REBURN_IN_STEPS = 300;
    public static final int DEFAULT_THIN_STEPS = 20;
    public static final int DEFAULT_BATCH_ROWS = 128;
    public static final double DEFAULT_LEARNING_RATE = 3e-3;
    /** The true posterior, p^(1/T) with T = 1: the default until 2026-12, still a setting. */
    public static final double TRUE_POSTERIOR_TEMPERATURE = 1.0;
    /**
     * A cold posterior, p^(1/T) with T = 0.1 (Wenzel et al. 2020, "How Good is the Bayes Posterior
     * in Deep Neural Networks Really?"): with a 9.6k-weight network, a few hundred labels and this
     * prior, the true posterior's typical draw is a noisy function, so chains wander apart (R-hat
     * 1.6-1.8 with all of digits' training rows), each draw is worse than a point estimate and
     * BALD's disagreement is mostly prior noise. At T = 0.1 the chains agree (R-hat 1.06-1.13) and
     * the predictive is as accurate as an Adam point estimate with lower NLL (PointEstimateTest);
     * the label-savings benchmark is in DEVELOPERS.md ("the posterior temperature").
     */
    public static final double COLD_POSTERIOR_TEMPERATURE = 0.1;
    public static final double DEFAULT_TEMPERATURE = COLD_POSTERIOR_TEMPERATURE;
    /** New chains start where the prior puts them, without a climb to a mode. */
    public static final int DEFAULT_MAP_STEPS = 0;

    /**
     * @param choice      which kernel; AUTO picks MALA up to {@code malaMaxRows} labelled rows, else
     *                    preconditioned SGLD
     * @param malaMaxRows the largest labelled set for which AUTO picks full-batch MALA
     */
    public record KernelRule(KernelChoice choice, int malaMaxRows) {

        public KernelRule {
            if (choice == null) {
                throw new IllegalArgumentException("kernel is required: auto, sgld, psgld or mala");
            }
            if (malaMaxRows < 0) {
                throw new IllegalArgumentException("malaMaxRows must be 0 or more, got " + malaMaxRows);
            }
        }
    }

    /**
     * @param hidden     hidden layer widths
     * @param activation hidden nonlinearity
     */
    public record Network(List<Integer> hidden, Activation activation) {

        public Network {
            hidden = Architecture.checkedHidden(hidden, activation);
        }
    }

    /**
     * @param count chains run side by side
     * @param draws draws kept in all, spread evenly over the chains
     */
    public record Chains(int count, int draws) {

        public Chains {
            if (count < 1) {
                throw new IllegalArgumentException("at least one chain is needed, got " + count);
            }
            if (draws < count || draws % count != 0) {
                throw new IllegalArgumentException("draws (" + draws + ") must be a positive multiple of chains ("
                        + count + ") so every chain keeps the same number");
            }
        }

        public int perChain() {
            return draws / count;
        }
    }

    /**
     * @param burnInSteps   steps before the first draw, for chains started from scratch
     * @param reburnInSteps steps before the first draw, for chains continued from a previous round
     * @param thinSteps     steps between kept draws
     * @param batchRows     mini-batch size of the stochastic-gradient kernels
     * @param learningRate  eta; the step size is eps = 2 eta / N for N labelled rows, so a step
     *                      moves about eta times a per-row gradient (MALA adapts its step from there)
     * @param cycles        0 for a constant step, else cycles of the cyclical schedule (one per draw of a chain)
     * @param mapSteps      Adam steps that carry a new chain's random start to a mode before it samples (0: none)
     */
    public record Steps(int burnInSteps, int reburnInSteps, int thinSteps, int batchRows, double learningRate,
                        int cycles, int mapSteps) {

        public Steps {
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
            if (cycles < 0) {
                throw new IllegalArgumentException("cycles must be 0 (constant step) or more, got " + cycles);
            }
            if (mapSteps < 0) {
                throw new IllegalArgumentException("mapSteps must be 0 (no climb to a mode) or more, got " + mapSteps);
            }
        }
    }

    public SamplerConfig {
        if (kernel == null || network == null || prior == null || chains == null || steps == null) {
            throw new IllegalArgumentException("every part of the sampler's configuration is required");
        }
        if (steps.cycles() > 0 && steps.cycles() != chains.perChain()) {
            throw new IllegalArgumentException("cycles must be 0 (constant step) or the draws per chain ("
                    + chains.perChain() + "), got " + steps.cycles());
        }
        if (!(temperature > 0) || Double.isInfinite(temperature)) {
            throw new IllegalArgumentException("temperature must be positive, got " + temperature
                    + "; 1 samples the true posterior");
        }
    }

    /** Every value at its named default. */
    public static SamplerConfig defaults() {
        return builder().build();
    }

    public static Builder builder() {
        return new Builder();
    }

    /** A builder holding this configuration's values. */
    public Builder toBuilder() {
        Builder b = new Builder();
        b.kernel = kernel.choice();
        b.malaMaxRows = kernel.malaMaxRows();
        b.hidden = network.hidden();
        b.activation = network.activation();
        b.prior = prior;
        b.chains = chains.count();
        b.draws = chains.draws();
        b.burnInSteps = steps.burnInSteps();
        b.reburnInSteps = steps.reburnInSteps();
        b.thinSteps = steps.thinSteps();
        b.batchRows = steps.batchRows();
        b.learningRate = steps.learningRate();
        b.cycles = steps.cycles();
        b.mapSteps = steps.mapSteps();
        b.temperature = temperature;
        return b;
    }

    /** Sets values one by one from the named defaults; {@link #build} validates them together. */
    public static final class Builder {

        private KernelChoice kernel = KernelChoice.parse(DEFAULT_KERNEL_WORD);
        private int malaMaxRows = DEFAULT_MALA_MAX_ROWS;
        private List<Integer> hidden = List.of(Architecture.DEFAULT_HIDDEN);
        private Activation activation = Activation.parse(DEFAULT_ACTIVATION_WORD);
        private Prior prior = Prior.standard();
        private int chains = DEFAULT_CHAINS;
        private int draws = DEFAULT_DRAWS;
        private int burnInSteps = DEFAULT_BURN_IN_STEPS;
        private int reburnInSteps = DEFAULT_REBURN_IN_STEPS;
        private int thinSteps = DEFAULT_THIN_STEPS;
        private int batchRows = DEFAULT_BATCH_ROWS;
        private double learningRate = DEFAULT_LEARNING_RATE;
        private int cycles;
        private int mapSteps = DEFAULT_MAP_STEPS;
        private double temperature = DEFAULT_TEMPERATURE;

        private Builder() {
        }

        public Builder kernel(KernelChoice k) {
            kernel = k;
            return this;
        }

        public Builder malaMaxRows(int rows) {
            malaMaxRows = rows;
            return this;
        }

        public Builder hidden(List<Integer> widths) {
            hidden = widths;
            return this;
        }

        public Builder activation(Activation a) {
            activation = a;
            return this;
        }

        public Builder prior(Prior p) {
            prior = p;
            return this;
        }

        /** {@code count} chains keeping {@code totalDraws} draws between them. */
        public Builder chains(int count, int totalDraws) {
            chains = count;
            draws = totalDraws;
            return this;
        }

        public Builder burnInSteps(int steps) {
            burnInSteps = steps;
            return this;
        }

        public Builder reburnInSteps(int steps) {
            reburnInSteps = steps;
            return this;
        }

        public Builder thinSteps(int steps) {
            thinSteps = steps;
            return this;
        }

        public Builder batchRows(int rows) {
            batchRows = rows;
            return this;
        }

        public Builder learningRate(double eta) {
            learningRate = eta;
            return this;
        }

        public Builder cycles(int n) {
            cycles = n;
            return this;
        }

        public Builder mapSteps(int n) {
            mapSteps = n;
            return this;
        }

        public Builder temperature(double t) {
            temperature = t;
            return this;
        }

        public SamplerConfig build() {
            return new SamplerConfig(new KernelRule(kernel, malaMaxRows), new Network(hidden, activation), prior,
                    new Chains(chains, draws), new Steps(burnInSteps, reburnInSteps, thinSteps, batchRows,
                    learningRate, cycles, mapSteps), temperature);
        }
    }
}
