package dev.dowser.store;

/**
 * A chain's last state as stored: enough to continue it. The store keeps numbers and bytes, not
 * meaning; the sampler's state is rebuilt from these by the rounds, and the kernel reads its own
 * state back from {@code kernelState}.
 */
public record SavedChain(int chain, int round, String kernel, String networkJson, float[] position,
                         byte[] kernelState, double[] hyper, double stepSize, long step) {
}
