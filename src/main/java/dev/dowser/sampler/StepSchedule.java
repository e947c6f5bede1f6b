package dev.dowser.sampler;

/**
 * How the step size varies over a run of K steps, as a factor of the base step size a0.
 * Constant keeps a0, as plain SGLD's theory asks (Welling & Teh 2011, with a decreasing schedule,
 * or constant in the usual practice). Cyclical is the cosine schedule of Zhang et al. (2020),
 * "Cyclical Stochastic Gradient MCMC for Bayesian Deep Learning", eq. 1:
 * a_k = a0 / 2 * (cos(pi * mod(k - 1, ceil(K / M)) / ceil(K / M)) + 1), for k = 1..K in M cycles.
 */
public record StepSchedule(int cycles) {

    public static final StepSchedule CONSTANT = new StepSchedule(0);

    public StepSchedule {
        if (cycles < 0) {
            throw new IllegalArgumentException("cycles must be 0 (constant) or more, got " + cycles);
        }
    }

    public static StepSchedule cyclical(int cycles) {
        if (cycles < 1) {
            throw new IllegalArgumentException("a cyclical schedule needs at least one cycle, got " + cycles);
        }
        return new StepSchedule(cycles);
    }

    public boolean isCyclical() {
        return cycles > 0;
    }

    /** a_k / a0 at step k (from 1) of a run of {@code totalSteps} steps. */
    public double factor(long k, long totalSteps) {
        if (cycles == 0) {
            return 1;
        }
        long period = cycleLength(totalSteps);
        return 0.5 * (Math.cos(Math.PI * ((k - 1) % period) / period) + 1);
    }

    /** ceil(K / M). */
    public long cycleLength(long totalSteps) {
        return (totalSteps + cycles - 1) / cycles;
    }

    /** a_k itself, for a0 = {@code a0}. */
    public double stepSize(double a0, long k, long totalSteps) {
        return a0 * factor(k, totalSteps);
    }
}
