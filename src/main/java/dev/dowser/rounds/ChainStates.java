package dev.dowser.rounds;

import dev.dowser.json.Json;
import dev.dowser.model.Architecture;
import dev.dowser.sampler.KernelChoice;
import dev.dowser.sampler.KernelState;
import dev.dowser.sampler.State;
import dev.dowser.store.SavedChain;
import java.util.ArrayList;
import java.util.List;

/** The one codec between the sampler's chain states and their stored rows. */
final class ChainStates {

    private ChainStates() {
    }

    static List<SavedChain> toSaved(List<State<?>> states, String kernel, Architecture arch, int round) {
        String network = Json.write(arch);
        List<SavedChain> out = new ArrayList<>();
        for (int c = 0; c < states.size(); c++) {
            State<?> s = states.get(c);
            out.add(new SavedChain(c, round, kernel, network, s.position(), s.extra().encode(), s.hyper(),
                    s.stepSize(), s.step()));
        }
        return out;
    }

    /**
     * The saved chains as states to continue from, or null when they cannot be continued: none
     * saved, a different network, or a different number of chains.
     */
    static List<State<?>> continuable(List<SavedChain> saved, Architecture arch, int chains) {
        if (saved.size() != chains) {
            return null;
        }
        String network = Json.write(arch);
        List<State<?>> out = new ArrayList<>();
        for (SavedChain s : saved) {
            if (!s.networkJson().equals(network)) {
                return null;
            }
            // The density and gradient depend on the labels, which have changed: the sampler re-evaluates them.
            KernelState extra = KernelChoice.parse(s.kernel()).decode(s.kernelState());
            out.add(new State<>(s.position(), new float[s.position().length], Double.NaN, s.hyper(), s.stepSize(),
                    s.step(), extra));
        }
        return out;
    }
}
