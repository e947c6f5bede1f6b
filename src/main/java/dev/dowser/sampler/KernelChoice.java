package dev.dowser.sampler;

import java.util.Locale;

/** Which Langevin kernel to run; {@code AUTO} decides by the size of the labelled set. */
public enum KernelChoice {
    AUTO,
    SGLD,
    PSGLD,
    MALA;

    public static KernelChoice parse(String word) {
        try {
            return valueOf(word.trim().toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException e) {
            throw new IllegalArgumentException("unknown kernel '" + word + "': use auto, sgld, psgld or mala");
        }
    }

    public String word() {
        return name().toLowerCase(Locale.ROOT);
    }
}
