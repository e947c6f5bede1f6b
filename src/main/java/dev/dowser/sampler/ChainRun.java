package dev.dowser.sampler;

import java.util.List;

/**
 * What one chain produced in a round: its final state (to continue from), the draws it kept with
 * the log density at each, and the divergences it recovered from.
 */
public record ChainRun(int chain, State<?> last, List<float[]> draws, double[] drawLogDensity,
                       List<Divergence> divergences, double seconds) {

    public ChainRun {
        draws = List.copyOf(draws);
        divergences = List.copyOf(divergences);
    }
}
