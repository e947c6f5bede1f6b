package dev.dowser.labels;

import dev.dowser.words.Worded;

/** A reviewer's decision on a record. */
public enum Verdict implements Worded {
    /** The people's label becomes final (refused while they disagree). */
    ACCEPT,
    /** The reviewer sets the final label, with a reason. */
    OVERRIDE;

    /** The verdict named by {@code word}; a clear error for anything else. */
    public static Verdict parse(String word) {
        return Worded.parse(Verdict.class, word, "verdict");
    }
}
