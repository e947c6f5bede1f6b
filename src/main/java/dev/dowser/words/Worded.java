package dev.dowser.words;

import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Optional;

/**
 * An enum whose constants people type, read and store as words: the one way a word becomes a
 * constant, and the one message when it names none.
 */
public interface Worded {

    /** The word typed, stored and shown: the constant's name in lower case, unless the enum says otherwise. */
    default String word() {
        return ((Enum<?>) this).name().toLowerCase(Locale.ROOT);
    }

    /** The constant whose word this is, ignoring case and surrounding spaces; empty for null or no match. */
    static <E extends Enum<E> & Worded> Optional<E> find(Class<E> type, String word) {
        if (word == null) {
            return Optional.empty();
        }
        String w = word.trim();
        return Arrays.stream(type.getEnumConstants()).filter(e -> e.word().equalsIgnoreCase(w)).findFirst();
    }

    /**
     * The constant whose word this is; otherwise an {@link IllegalArgumentException} saying
     * "unknown {@code what} 'word': use a, b or c".
     */
    static <E extends Enum<E> & Worded> E parse(Class<E> type, String word, String what) {
        return find(type, word).orElseThrow(() -> unknown(what, word, words(type)));
    }

    /** The words of every constant, in declaration order. */
    static <E extends Enum<E> & Worded> List<String> words(Class<E> type) {
        return Arrays.stream(type.getEnumConstants()).map(Worded::word).toList();
    }

    /** The refusal of a word that names none of {@code choices}. */
    static IllegalArgumentException unknown(String what, String word, List<String> choices) {
        String listed = choices.size() == 1 ? choices.get(0)
                : String.join(", ", choices.subList(0, choices.size() - 1)) + " or " + choices.get(choices.size() - 1);
        return new IllegalArgumentException("unknown " + what + " '" + word + "': use " + listed);
    }
}
