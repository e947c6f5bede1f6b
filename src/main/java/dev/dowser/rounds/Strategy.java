package dev.dowser.rounds;

import java.util.Arrays;
import java.util.Locale;
import java.util.stream.Collectors;

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
    /** The b smallest margins between the two likeliest classes. */
    MARGIN,
    /** Uniformly at random: the baseline. */
    RANDOM;

    /** The word that means whatever a new pool uses, so scripts follow the default as it changes. */
    public static final String DEFAULT_WORD = "default";

    /** A strategy by its word, or {@code default} for a new pool's. */
    public static Strategy parse(String word) {
        String w = word.trim().toLowerCase(Locale.ROOT);
        if (w.equals(DEFAULT_WORD)) {
            return PoolSettings.DEFAULT_STRATEGY;
        }
        for (Strategy s : values()) {
            if (s.word().equals(w)) {
                return s;
            }
        }
        throw new IllegalArgumentException("unknown strategy '" + word + "': use "
                + Arrays.stream(values()).map(Strategy::word).collect(Collectors.joining(", ")) + " or "
                + DEFAULT_WORD);
    }

    public String word() {
        return name().toLowerCase(Locale.ROOT);
    }
}
