package dev.dowser.labels;

import java.time.Instant;

/**
 * One row said about a record, as it was appended: a person's label ({@code verdict} null), its
 * withdrawal ({@code withdrawn}, naming the label taken back), or a reviewer's decision.
 */
public record LabelEvent(long row, String label, String by, Instant at, String note, boolean withdrawn,
                         Verdict verdict) {

    /** A reviewer's decision rather than a person's label. */
    public boolean review() {
        return verdict != null;
    }
}
