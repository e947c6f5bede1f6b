package dev.dowser.sampler;

import java.util.SplittableRandom;

/**
 * One step of a Markov chain: a pure function of the state, the batch the gradient is estimated
 * on, and the chain's random numbers. The chain owns the loop; the kernel owns the maths and its
 * own state {@code E}, and tunes itself when the chain asks during burn-in.
 *
 * @param <E> what the kernel keeps beside the position
 */
public interface Kernel<E extends KernelState> {

    State<E> step(State<E> state, Batch batch, SplittableRandom rng);

    /** Whether each step needs the whole data set rather than a mini-batch; a mini-batch unless the kernel says so. */
    default boolean fullBatch() {
        return false;
    }

    /** A short name for reports: sgld, psgld, mala, sghmc. */
    String name();

    /**
     * Evaluates the target at {@code position} to start a chain there. {@code previous} is the
     * state of the chain being continued (a warm start after the labels changed, or after new
     * hyperparameters), or null for a new chain: the kernel keeps of it what still applies (its
     * own state, when the previous state is one of its own) and counts steps on from it.
     */
    State<E> start(float[] position, double[] hyper, double stepSize, Batch batch, State<?> previous);

    /**
     * Called by the chain after each burn-in step (step {@code k} from 1), with the state before
     * and after it: a kernel that tunes itself returns the tuned state. By default nothing changes.
     */
    default State<E> adapt(State<E> before, State<E> after, long k) {
        return after;
    }
}
