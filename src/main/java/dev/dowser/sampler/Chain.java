package dev.dowser.sampler;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;

/**
 * One Langevin chain: runs a kernel for a round, handing it mini-batches (an epoch order shuffled
 * with the chain's own generator), scaling the step by the schedule, asking the kernel to adapt
 * during burn-in, resampling hyperparameters, keeping draws, and recovering from divergences: a
 * non-finite density or gradient restores the last good state and halves the step size.
 *
 * @param <E> the kernel's own state
 */
public final class Chain<E extends KernelState> {

    /** A run of divergences this long means the chain cannot recover. */
    static final int MAX_DIVERGENCES_IN_A_ROW = 40;

    private final int index;
    private final Kernel<E> kernel;
    private final Target target;
    private final SplittableRandom rng;
    private Epochs epochs;

    public Chain(int index, Kernel<E> kernel, Target target, SplittableRandom rng) {
        this.index = index;
        this.kernel = kernel;
        this.target = target;
        this.rng = rng;
    }

    public ChainRun run(State<E> start, ChainConfig config) {
        return run(start, config, StopSignal.never());
    }

    /** Runs the round; when {@code stop} is raised the chain ends after the step it is taking. */
    public ChainRun run(State<E> start, ChainConfig config, StopSignal stop) {
        long begun = System.nanoTime();
        long total = config.totalSteps();
        int n = Math.min(config.batchRows(), target.dataSize());
        State<E> s = start;
        List<float[]> draws = new ArrayList<>(config.draws());
        double[] drawLogDensity = new double[config.draws()];
        List<Divergence> divergences = new ArrayList<>();
        int inARow = 0;
        for (long k = 1; k <= total && !stop.requested(); k++) {
            Batch batch = kernel.fullBatch() ? Batch.full(target.dataSize()) : nextBatch(n);
            double base = s.stepSize();
            State<E> next = kernel.step(s.withStepSize(base * config.schedule().factor(k, total)), batch, rng)
                    .withStepSize(base);
            if (!next.isFinite()) {
                double halved = base / 2;
                divergences.add(new Divergence(index, s.step() + 1, "non-finite log density or gradient", halved));
                if (++inARow > MAX_DIVERGENCES_IN_A_ROW) {
                    throw new IllegalStateException("chain " + index + " diverged " + inARow
                            + " times in a row; lower the step size");
                }
                s = s.withStepSize(halved);
                continue;
            }
            inARow = 0;
            if (config.adaptSteps() && k <= config.burnInSteps()) {
                next = kernel.adapt(s, next, k);
            }
            s = next;
            if (s.hyper() != null && k % config.gibbsEvery() == 0) {
                double[] hyper = target.resampleHyper(s.position(), s.hyper(), rng);
                s = kernel.start(s.position(), hyper, s.stepSize(),
                        kernel.fullBatch() ? Batch.full(target.dataSize()) : nextBatch(n), s);
            }
            if (config.keepsDrawAt(k) && draws.size() < config.draws()) {
                drawLogDensity[draws.size()] = s.logDensity();
                draws.add(s.position().clone());
            }
        }
        return new ChainRun(index, s, draws, drawLogDensity, divergences, (System.nanoTime() - begun) / 1e9);
    }

    /** The next n rows of a shuffled epoch order. */
    private Batch nextBatch(int n) {
        if (epochs == null || epochs.rows() != target.dataSize()) {
            epochs = new Epochs(target.dataSize(), rng);
        }
        return epochs.next(n);
    }
}
