package dev.dowser.store;

/**
 * A chain's last state as stored: enough to continue it. The store keeps numbers, not meaning;
 * the sampler's state is rebuilt from these by the rounds.
 */
public record SavedChain(int chain, int round, String kernel, String networkJson, float[] position,
                         float[] preconditioner, double[] hyper, double stepSize, long step, long accepted,
                         long proposed) {
}
