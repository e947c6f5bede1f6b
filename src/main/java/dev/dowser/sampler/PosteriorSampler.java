package dev.dowser.sampler;

import dev.dowser.model.Architecture;
import dev.dowser.model.Layout;
import dev.dowser.model.Prior;
import dev.dowser.stats.SeedTree;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;

/**
 * Samples the network's posterior given labelled rows: picks the kernel, starts the chains (from
 * scratch, or from where the previous round's chains stopped: a warm start), runs them side by
 * side, and summarises their health on function-space quantities.
 */
public final class PosteriorSampler {

    private final SamplerConfig config;
    private final int threads;

    /** Chains run on up to one thread per core. */
    public PosteriorSampler(SamplerConfig config) {
        this(config, Runtime.getRuntime().availableProcessors());
    }

    /** Chains run on up to {@code threads} threads (fewer when there are fewer chains). */
    public PosteriorSampler(SamplerConfig config, int threads) {
        if (threads < 1) {
            throw new IllegalArgumentException("a sampler needs at least one thread, got " + threads);
        }
        this.config = config;
        this.threads = threads;
    }

    public SamplerConfig config() {
        return config;
    }

    /** The kernel for a labelled set of {@code rows}, and why, in words for the person who runs the pool. */
    public record Choice(KernelChoice kernel, String why) {
    }

    public static Choice choose(SamplerConfig config, int rows) {
        if (config.kernel().choice() != KernelChoice.AUTO) {
            return new Choice(config.kernel().choice(), config.kernel().choice().word() + " was asked for");
        }
        if (rows <= config.kernel().malaMaxRows()) {
            return new Choice(KernelChoice.MALA, rows + " labelled rows are few enough (at most "
                    + config.kernel().malaMaxRows() + ") for full-batch gradients, so MALA's accept-reject test"
                    + " makes the draws exact in the limit");
        }
        return new Choice(KernelChoice.PSGLD, rows + " labelled rows are more than " + config.kernel().malaMaxRows()
                + ", so mini-batches of " + config.steps().batchRows() + " keep steps cheap; preconditioned SGLD adapts"
                + " each weight's step to its gradient's scale");
    }

    public Layout layout(int inputs, int classes) {
        return new Layout(new Architecture(inputs, config.network().hidden(), classes, config.network().activation()));
    }

    /**
     * Runs one round on the labelled rows {@code x} (standardised, row-major) with class indices
     * {@code labels}. {@code previous} holds the chains' last states from the round before (same
     * network), or is null to start from scratch. {@code probe} holds rows whose predictive
     * probabilities serve as diagnostics summaries (may be empty). Chain c draws its random numbers
     * from branch c of {@code seeds}.
     */
    public RoundDraws sample(float[] x, int[] labels, int classes, List<State<?>> previous, float[] probe,
                             SeedTree seeds) {
        return sample(x, labels, classes, previous, probe, seeds, StopSignal.never());
    }

    /**
     * As above; when {@code stop} is raised the chains end at their next safe point and
     * {@link SamplingStopped} carries their states.
     */
    public RoundDraws sample(float[] x, int[] labels, int classes, List<State<?>> previous, float[] probe,
                             SeedTree seeds, StopSignal stop) {
        long begun = System.nanoTime();
        int rows = labels.length;
        if (rows == 0) {
            throw new IllegalArgumentException("the posterior needs at least one labelled row");
        }
        int inputs = x.length / rows;
        Layout layout = layout(inputs, classes);
        Choice choice = choose(config, rows);
        boolean warm = previous != null && !previous.isEmpty();
        if (warm && previous.size() != config.chains().count()) {
            throw new IllegalArgumentException(previous.size() + " saved chains but " + config.chains().count() + " asked for");
        }
        int perChain = config.chains().perChain();
        StepSchedule schedule = config.steps().cycles() > 0 ? StepSchedule.cyclical(config.steps().cycles())
                : StepSchedule.CONSTANT;
        ChainConfig chainConfig = new ChainConfig(warm ? config.steps().reburnInSteps() : config.steps().burnInSteps(),
                perChain, config.steps().thinSteps(), config.steps().batchRows(), schedule, true, ChainConfig.DEFAULT_GIBBS_EVERY);
        double stepSize = 2 * config.steps().learningRate() / rows;
        List<ChainSet.Job<?>> jobs = new ArrayList<>();
        List<MlpPosterior> targets = new ArrayList<>();
        int workRows = Math.min(rows, Math.max(config.steps().batchRows(), 256));
        for (int c = 0; c < config.chains().count(); c++) {
            MlpPosterior target = new MlpPosterior(layout, config.prior(), x, labels, workRows);
            targets.add(target);
            Kernel<?> kernel = choice.kernel().kernel(target, config.temperature());
            SplittableRandom rng = seeds.child(c).rng();
            Batch first = kernel.fullBatch() ? Batch.full(rows) : Batch.full(Math.min(rows, config.steps().batchRows()));
            if (warm) {
                // Continue from the last position; the density changed with the labels, so the kernel re-evaluates it.
                State<?> p = previous.get(c);
                if (p.position().length != layout.dimension()) {
                    throw new IllegalArgumentException("the saved chains are for a different network");
                }
                jobs.add(ChainSet.job(c, kernel, target, rng, p.position(), p.hyper(), stepSize, first, p));
            } else {
                float[] theta = Prior.start(layout, rng);
                if (config.steps().mapSteps() > 0) {
                    climb(target, theta, config.steps().mapSteps(), config.steps().batchRows(), rng);
                }
                jobs.add(ChainSet.job(c, kernel, target, rng, theta, target.initialHyper(), stepSize, first, null));
            }
        }
        List<ChainRun> runs;
        try (ChainSet set = new ChainSet(Math.min(threads, config.chains().count()))) {
            runs = set.run(jobs, chainConfig, stop);
        }
        if (stop.requested()) {
            throw new SamplingStopped(choice, layout, runs.stream().map(ChainRun::last).toList());
        }
        Health health = Health.of(runs, targets.get(0), layout, probe);
        return new RoundDraws(choice, layout, runs, health, warm, (System.nanoTime() - begun) / 1e9,
                chainConfig.totalSteps() * config.chains().count());
    }

    /**
     * Moves a new chain's start to a mode first: Adam (Kingma & Ba 2015) up the log posterior on
     * mini-batches, each chain from its own random start, so chains begin at independently
     * optimised points, as in deep-ensemble-initialised sampling (Sommer et al. 2024).
     */
    static void climb(Target target, float[] theta, int steps, int batchRows, SplittableRandom rng) {
        int n = target.dataSize();
        int b = Math.min(batchRows, n);
        Adam adam = new Adam(theta.length, Adam.DEFAULT_LEARNING_RATE);
        float[] grad = new float[theta.length];
        Epochs epochs = new Epochs(n, rng);
        for (int t = 0; t < steps; t++) {
            target.logDensity(theta, target.initialHyper(), epochs.next(b), grad);
            for (int i = 0; i < grad.length; i++) {
                grad[i] /= n;
            }
            adam.step(theta, grad);
        }
    }
}
