package dev.dowser.sampler;

/**
 * What a kernel keeps of its own beyond the position (preconditioned SGLD's running mean square of
 * the gradient, MALA's acceptance counts, SGHMC's momentum): carried from step to step, and from
 * round to round through the kernel's own bytes, which {@link KernelChoice#decode} reads back.
 */
public interface KernelState {

    /** The bytes that store this state between rounds. */
    byte[] encode();

    /** The share of Metropolis-Hastings proposals accepted so far; NaN for a kernel without an accept-reject test. */
    default double acceptanceRate() {
        return Double.NaN;
    }
}
