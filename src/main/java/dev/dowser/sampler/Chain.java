package dev.dowser.sampler;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;

/**
 * One Langevin chain: runs a kernel for a round, handing it mini-batches (an epoch order shuffled
 * with the chain's own generator), scaling the step by the schedule, tuning the step of an
 * accept-reject kernel during burn-in, resampling hyperparameters, keeping draws, and recovering
 * from divergences: a non-finite density or gradient restores the last good state and halves the
 * step size.
 */
public final class Chain {

    /** Robbins-Monro gain for step-size tuning: gamma_t = GAIN / sqrt(t + 10). */
    static final double ADAPT_GAIN = 1.0;
    /** A run of divergences this long means the chain cannot recover. */
    static final int MAX_DIVERGENCES_IN_A_ROW = 40;

    private final int index;
    private final Kernel kernel;
    private final Target target;
    private final SplittableRandom rng;
    private int[] order;
    private int cursor;

    public Chain(int index, Kernel kernel, Target target, SplittableRandom rng) {
        this.index = index;
        this.kernel = kernel;
        this.target = target;
        this.rng = rng;
    }

    public ChainRun run(State start, ChainConfig config) {
        return run(start, config, StopSignal.never());
    }

    /** Runs the round; when {@code stop} is raised the chain ends after the step it is taking. */
    public ChainRun run(State start, ChainConfig config, StopSignal stop) {
        long begun = System.nanoTime();
        long total = config.totalSteps();
        int n = Math.min(config.batchRows(), target.dataSize());
        State s = start;
        List<float[]> draws = new ArrayList<>(config.draws());
        double[] drawLogDensity = new double[config.draws()];
        List<Divergence> divergences = new ArrayList<>();
        int inARow = 0;
        for (long k = 1; k <= total && !stop.requested(); k++) {
            Batch batch = kernel.fullBatch() ? Batch.full(target.dataSize()) : nextBatch(n);
            double base = s.stepSize();
            State next = kernel.step(s.withStepSize(base * config.schedule().factor(k, total)), batch, rng)
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
            if (config.adaptSteps() && kernel.fullBatch() && k <= config.burnInSteps()) {
                double accepted = next.accepted() - s.accepted();
                double gamma = ADAPT_GAIN / Math.sqrt(k + 10);
                next = next.withStepSize(base * Math.exp(gamma * (accepted - Mala.TARGET_ACCEPTANCE)));
            }
            s = next;
            if (s.hyper() != null && k % config.gibbsEvery() == 0) {
                double[] hyper = target.resampleHyper(s.position(), s.hyper(), rng);
                State fresh = kernel.start(s.position(), hyper, s.stepSize(),
                        kernel.fullBatch() ? Batch.full(target.dataSize()) : nextBatch(n));
                s = new State(fresh.position(), fresh.gradient(), fresh.logDensity(), s.preconditioner(), hyper,
                        s.stepSize(), s.step(), s.accepted(), s.proposed());
            }
            if (config.keepsDrawAt(k) && draws.size() < config.draws()) {
                drawLogDensity[draws.size()] = s.logDensity();
                draws.add(s.position().clone());
            }
        }
        return new ChainRun(index, s, draws, drawLogDensity, divergences, (System.nanoTime() - begun) / 1e9);
    }

    /** The next n rows of a shuffled epoch order (Fisher-Yates), reshuffled when used up. */
    private Batch nextBatch(int n) {
        int size = target.dataSize();
        if (order == null || order.length != size) {
            order = new int[size];
            for (int i = 0; i < size; i++) {
                order[i] = i;
            }
            cursor = size;
        }
        if (cursor + n > size) {
            for (int i = size - 1; i > 0; i--) {
                int j = rng.nextInt(i + 1);
                int t = order[i];
                order[i] = order[j];
                order[j] = t;
            }
            cursor = 0;
        }
        int[] rows = new int[n];
        System.arraycopy(order, cursor, rows, 0, n);
        cursor += n;
        return new Batch(rows, n);
    }
}
