package dev.dowser.sampler;

/**
 * Two sets of arrays a kernel writes its new states into, in turn, so a step allocates nothing:
 * each step writes into the set the given state does not use. A state returned by a kernel
 * therefore stays intact for one more step, which is all a chain needs (it keeps only its current
 * state and copies the draws it keeps). Measured by {@code dowser bench}: allocating three fresh
 * arrays of the network's size every step cost a fifth of the step.
 */
final class Buffers {

    private final float[][] position = new float[2][];
    private final float[][] gradient = new float[2][];
    private final float[][] extra = new float[2][];

    Buffers(int dimension, boolean withExtra) {
        for (int i = 0; i < 2; i++) {
            position[i] = new float[dimension];
            gradient[i] = new float[dimension];
            extra[i] = withExtra ? new float[dimension] : null;
        }
    }

    /** Which set to write the next state into: the one the current state's position is not in. */
    int free(State<?> current) {
        return current.position() == position[0] ? 1 : 0;
    }

    float[] position(int set) {
        return position[set];
    }

    float[] gradient(int set) {
        return gradient[set];
    }

    float[] extra(int set) {
        return extra[set];
    }

    /**
     * The state one step on from {@code from}, at the position the kernel wrote into {@code set}:
     * the target evaluated there, with its gradient written into the set. Every kernel's step ends so.
     */
    <E extends KernelState> State<E> next(int set, State<?> from, Target target, Batch batch, E extra) {
        double logp = target.logDensity(position[set], from.hyper(), batch, gradient[set]);
        return new State<>(position[set], gradient[set], logp, from.hyper(), from.stepSize(), from.step() + 1, extra);
    }
}
