package dev.dowser.rounds;

import java.util.Locale;

/** How a round picks its batch. */
public enum Strategy {
    /** The b highest BALD scores. */
    BALD,
    /** Stochastic power sampling on BALD (beta = 1). */
    POWER,
    /** Greedy BatchBALD over the best BALD candidates. */
    BATCHBALD,
    /** The b highest predictive entropies. */
    ENTROPY,
    /** Uniformly at random: the baseline. */
    RANDOM;

    public static Strategy parse(String word) {
        try {
            return valueOf(word.trim().toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException e) {
            throw new IllegalArgumentException("unknown strategy '" + word
                    + "': use bald, power, batchbald, entropy or random");
        }
    }

    public String word() {
        return name().toLowerCase(Locale.ROOT);
    }
}
