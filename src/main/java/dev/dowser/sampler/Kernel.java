package dev.dowser.sampler;

import java.util.SplittableRandom;

/**
 * One step of a Markov chain: a pure function of the state, the batch the gradient is estimated
 * on, and the chain's random numbers. The chain owns the loop; the kernel owns the maths.
 */
public interface Kernel {

    State step(State state, Batch batch, SplittableRandom rng);

    /** Whether the kernel needs the full data set each step (it has an accept-reject test). */
    boolean fullBatch();

    /** A short name for reports: sgld, psgld, mala. */
    String name();

    /** Evaluates the target at a position, to start or restart a chain there. */
    State start(float[] position, double[] hyper, double stepSize, Batch batch);
}
