package dev.dowser.sampler;

import dev.dowser.model.Layout;
import java.util.ArrayList;
import java.util.List;

/**
 * What one round of sampling produced: the kernel used and why, every chain's run (its draws, its
 * last state to continue from, its divergences), and the chains' health.
 */
public record RoundDraws(PosteriorSampler.Choice choice, Layout layout, List<ChainRun> runs, Health health,
                     boolean warmStart, double seconds, long chainSteps) {

    public RoundDraws {
        runs = List.copyOf(runs);
    }

    /** Every draw, chain after chain. */
    public List<float[]> draws() {
        List<float[]> all = new ArrayList<>();
        runs.forEach(r -> all.addAll(r.draws()));
        return all;
    }

    /** Where each chain stopped, to continue from next round. */
    public List<State<?>> lastStates() {
        return runs.stream().<State<?>>map(ChainRun::last).toList();
    }

    public List<Divergence> divergences() {
        List<Divergence> all = new ArrayList<>();
        runs.forEach(r -> all.addAll(r.divergences()));
        return all;
    }
}
