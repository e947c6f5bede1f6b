package dev.dowser.sampler;

import dev.dowser.words.Worded;
import java.util.function.BiFunction;
import java.util.function.Function;

/**
 * Which Langevin kernel to run: {@code AUTO} lets {@link PosteriorSampler#choose} decide by the
 * size of the labelled set; each other word names a kernel, how to make it, and how to read back
 * the state it stores between rounds.
 */
public enum KernelChoice implements Worded {
    AUTO(null, null),
    SGLD(Sgld::new, Sgld.Plain::decode),
    PSGLD(PreconditionedSgld::new, PreconditionedSgld.Preconditioner::decode),
    MALA(Mala::new, Mala.Counts::decode),
    SGHMC(Sghmc::new, Sghmc.Momentum::decode);

    private final BiFunction<Target, Double, Kernel<?>> make;
    private final Function<byte[], KernelState> decode;

    KernelChoice(BiFunction<Target, Double, Kernel<?>> make, Function<byte[], KernelState> decode) {
        this.make = make;
        this.decode = decode;
    }

    public static KernelChoice parse(String word) {
        return Worded.parse(KernelChoice.class, word, "kernel");
    }

    /** The kernel this word names, on {@code target} at {@code temperature}. */
    Kernel<?> kernel(Target target, double temperature) {
        if (make == null) {
            throw new IllegalArgumentException("auto names no kernel until the labelled set's size is known");
        }
        return make.apply(target, temperature);
    }

    /** The kernel's own state from the bytes it stored; null when none was stored. */
    public KernelState decode(byte[] bytes) {
        if (decode == null) {
            throw new IllegalArgumentException("auto stores no kernel state");
        }
        return bytes == null ? null : decode.apply(bytes);
    }
}
