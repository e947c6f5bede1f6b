package dev.dowser.sampler;

import dev.dowser.model.Layout;
import java.util.List;

/**
 * Sampling ended early because a {@link StopSignal} was raised. It carries where each chain
 * stopped (a whole step each), so the caller can save the states and continue them later.
 */
public final class SamplingStopped extends RuntimeException {

    private final transient PosteriorSampler.Choice choice;
    private final transient Layout layout;
    private final transient List<State<?>> lastStates;

    public SamplingStopped(PosteriorSampler.Choice choice, Layout layout, List<State<?>> lastStates) {
        super("sampling stopped at a safe point on request");
        this.choice = choice;
        this.layout = layout;
        this.lastStates = List.copyOf(lastStates);
    }

    public PosteriorSampler.Choice choice() {
        return choice;
    }

    public Layout layout() {
        return layout;
    }

    public List<State<?>> lastStates() {
        return lastStates;
    }
}
