package dev.dowser.labels;

import java.util.Locale;

/** A reviewer's decision on a record. */
public enum Verdict {
    /** The people's label becomes final (refused while they disagree). */
    ACCEPT,
    /** The reviewer sets the final label, with a reason. */
    OVERRIDE;

    /** The word stored and sent. */
    public String word() {
        return name().toLowerCase(Locale.ROOT);
    }

    /** The verdict named by {@code word}; a clear error for anything else. */
    public static Verdict parse(String word) {
        for (Verdict v : values()) {
            if (v.word().equals(word)) {
                return v;
            }
        }
        throw new IllegalArgumentException("a review is accept or override, got '" + word + "'");
    }
}
