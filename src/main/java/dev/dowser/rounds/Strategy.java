package dev.dowser.rounds;

import dev.dowser.words.Worded;
import java.util.ArrayList;
import java.util.List;

/** How a round picks its batch. */
public enum Strategy implements Worded {
    /** The b highest BALD scores. */
    BALD,
    /** Stochastic power sampling on BALD (beta = 1). */
    POWER,
    /**
     * TypiClust's typical records while the pool has fewer than 10 labels per class, then power
     * sampling: for small budgets (on digits 90% at 80 labels against power's 120), at a cost later
     * and on imbalanced pools (DEVELOPERS.md, "the low-budget phase").
     */
    TYPICLUST_POWER {
        @Override
        public String word() {
            return "typiclust-power";
        }
    },
    /**
     * Each batch takes TypiClust's typical records of the uncovered clusters that the model is
     * still unsure of, and power sampling fills the rest: the typical phase ends when the model,
     * not a count of labels, says the dense regions are learnt (DEVELOPERS.md, "the low-budget phase").
     */
    TYPICLUST_MIX {
        @Override
        public String word() {
            return "typiclust-mix";
        }
    },
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
        if (word != null && word.trim().equalsIgnoreCase(DEFAULT_WORD)) {
            return PoolSettings.DEFAULT_STRATEGY;
        }
        return Worded.find(Strategy.class, word).orElseThrow(() -> {
            List<String> choices = new ArrayList<>(Worded.words(Strategy.class));
            choices.add(DEFAULT_WORD);
            return Worded.unknown("strategy", word, choices);
        });
    }
}
