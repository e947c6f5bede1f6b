package dev.dowser.store;

import java.time.Instant;

/**
 * One place in a served queue: the record, why it was picked, who holds it until when, and how
 * many different people must label it ({@code copies}: 1, or 2 when agreement is measured on it).
 */
public record QueueEntry(int round, int position, long row, double score, boolean spotCheck, String predictionJson,
                         String leasedTo, Instant leaseUntil, int copies) {

    public QueueEntry {
        if (copies < 1 || copies > 2) {
            throw new IllegalArgumentException("a queued record is labelled by 1 or 2 people, not " + copies);
        }
    }

    /** An entry that one person labels. */
    public QueueEntry(int round, int position, long row, double score, boolean spotCheck, String predictionJson,
                      String leasedTo, Instant leaseUntil) {
        this(round, position, row, score, spotCheck, predictionJson, leasedTo, leaseUntil, 1);
    }

    /** What the model believed of the record when it was queued; null for the first batch, picked before any model. */
    public Belief belief() {
        return predictionJson == null ? null : Belief.parse(predictionJson);
    }

    public QueueEntry withCopies(int n) {
        return new QueueEntry(round, position, row, score, spotCheck, predictionJson, leasedTo, leaseUntil, n);
    }
}
