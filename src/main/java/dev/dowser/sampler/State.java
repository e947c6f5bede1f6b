package dev.dowser.sampler;

/**
 * Where a chain stands after a step. A kernel never writes into the arrays of the state it is
 * given; it returns a new state. To spare an allocation per step, a kernel reuses the arrays of
 * the state before the one it was given: a state stays intact until its kernel's next-but-one
 * step, so a caller that keeps a state longer (a draw, a chain's last state) copies it or stops
 * using the kernel.
 *
 * @param position   the parameters theta
 * @param gradient   the gradient of the log density at theta, as last estimated
 * @param logDensity the log density at theta, as last estimated
 * @param hyper      hyperparameters (layer precisions of a hierarchical prior); null when none
 * @param stepSize   the base step size; a schedule scales it, a divergence halves it
 * @param step       steps taken since the chain began, over all rounds
 * @param extra      what the kernel keeps of its own
 * @param <E>        the kernel's own state
 */
public record State<E extends KernelState>(float[] position, float[] gradient, double logDensity, double[] hyper,
                                           double stepSize, long step, E extra) {

    public State<E> withStepSize(double newStepSize) {
        return new State<>(position, gradient, logDensity, hyper, newStepSize, step, extra);
    }

    public State<E> withStep(long newStep) {
        return new State<>(position, gradient, logDensity, hyper, stepSize, newStep, extra);
    }

    public State<E> withExtra(E newExtra) {
        return new State<>(position, gradient, logDensity, hyper, stepSize, step, newExtra);
    }

    /**
     * True when the density and every gradient entry are finite: the state is usable. The position
     * needs no check of its own: every target here has a proper prior, whose gradient term
     * (-tau * theta for a Gaussian) turns an infinite or NaN weight into a non-finite gradient.
     */
    public boolean isFinite() {
        return Double.isFinite(logDensity) && allFinite(gradient);
    }

    /** x * 0 is 0 for every finite x and NaN for an infinity or NaN, so one sum tells, without a branch per entry. */
    private static boolean allFinite(float[] v) {
        float acc = 0f;
        for (float x : v) {
            acc += x * 0f;
        }
        return acc == 0f;
    }
}
