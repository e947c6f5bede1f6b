package dev.dowser.labels;

import dev.dowser.words.Worded;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Where a record's labels stand: each person's current label (their opinion), the review in force
 * if any, and from these the final label. The final label is the reviewer's when there is one,
 * else the label everyone gave (one person, or several who agree); people who disagree leave the
 * record unresolved until a reviewer decides.
 */
public record Resolution(long row, List<Opinion> opinions, Review review) {

    /** Where the record stands, by its word in the API and the export. */
    public enum Status implements Worded {
        /** One person's label, no review. */
        SINGLE,
        /** Several people gave the same label. */
        AGREED,
        /** A reviewer decided. */
        REVIEWED,
        /** People disagree and no reviewer has decided yet. */
        UNRESOLVED
    }

    /** One person's current label of the record. */
    public record Opinion(String person, String label, Instant at, String note) {
    }

    /** A reviewer's decision; {@code reason} is required for an override. */
    public record Review(String reviewer, Verdict verdict, String label, String reason, Instant at) {
    }

    public Resolution {
        opinions = List.copyOf(opinions);
    }

    /**
     * The rule that turns what was said about one record, oldest first, into where it stands: a
     * person's newer label replaces their older one, a withdrawal removes it, and the newest review
     * is in force. Opinions keep the order in which they were last given.
     */
    public static Resolution fold(long row, List<LabelEvent> events) {
        Map<String, Opinion> opinions = new LinkedHashMap<>();
        Review review = null;
        for (LabelEvent e : events) {
            if (e.review()) {
                review = new Review(e.by(), e.verdict(), e.label(), e.note(), e.at());
            } else {
                opinions.remove(e.by());
                if (!e.withdrawn()) {
                    opinions.put(e.by(), new Opinion(e.by(), e.label(), e.at(), e.note()));
                }
            }
        }
        return new Resolution(row, new ArrayList<>(opinions.values()), review);
    }

    /** Nothing stands: no opinion, no review (every label taken back, or none given). */
    public boolean empty() {
        return opinions.isEmpty() && review == null;
    }

    public boolean peopleDisagree() {
        return opinions.stream().map(Opinion::label).distinct().count() > 1;
    }

    public Status status() {
        if (review != null) {
            return Status.REVIEWED;
        }
        if (peopleDisagree()) {
            return Status.UNRESOLVED;
        }
        return opinions.size() == 1 ? Status.SINGLE : Status.AGREED;
    }

    /** The final label with who decided it, or null while unresolved. */
    public LabelRow finalLabel() {
        if (review != null) {
            return new LabelRow(row, review.label(), review.reviewer(), review.at(), review.reason());
        }
        if (opinions.isEmpty() || peopleDisagree()) {
            return null;
        }
        Opinion last = opinions.get(opinions.size() - 1);
        if (opinions.size() == 1) {
            return new LabelRow(row, last.label(), last.person(), last.at(), last.note());
        }
        String people = String.join(" & ", opinions.stream().map(Opinion::person).toList());
        return new LabelRow(row, last.label(), people, last.at(), notes());
    }

    /** The people's notes joined, or null when nobody wrote one. */
    public String notes() {
        String notes = String.join(" / ", opinions.stream().map(Opinion::note).filter(n -> n != null).toList());
        return notes.isEmpty() ? null : notes;
    }

    /** The newest time anything was said about the record. */
    public Instant lastAt() {
        Instant t = review == null ? null : review.at();
        for (Opinion o : opinions) {
            if (t == null || o.at().isAfter(t)) {
                t = o.at();
            }
        }
        return t;
    }
}
