package dev.dowser.store;

import java.time.Instant;

/**
 * One place in a queue: the record, why it was picked, who holds it until when (when read with its
 * lease), how many different people must label it ({@code copies}: 1, or 2 when agreement is
 * measured on it), the probability with which it was picked given the places picked before it
 * ({@code pickProbability}; null for queues written before it was kept, and for reserve places),
 * its place in its round's sequence of picks ({@code pickOrder}, 1 first; null when carried over
 * from an earlier round, whose own entry keeps its place, for reserve places, and for queues written
 * before it was kept), and whether it is one of the round's next-best records served after its
 * batch ({@code reserve}).
 */
public record QueueEntry(int round, int position, long row, double score, boolean spotCheck, String predictionJson,
                         String leasedTo, Instant leaseUntil, int copies, Double pickProbability, Integer pickOrder,
                         boolean reserve) {

    public QueueEntry {
        if (copies < 1 || copies > 2) {
            throw new IllegalArgumentException("a queued record is labelled by 1 or 2 people, not " + copies);
        }
        if (pickProbability != null && !(pickProbability > 0 && pickProbability <= 1)) {
            throw new IllegalArgumentException("a pick's probability lies in (0, 1], not " + pickProbability);
        }
        if (pickOrder != null && pickOrder < 1) {
            throw new IllegalArgumentException("a pick's place in its round counts from 1, not " + pickOrder);
        }
    }

    /** A place of a round's batch. */
    public QueueEntry(int round, int position, long row, double score, boolean spotCheck, String predictionJson,
                      String leasedTo, Instant leaseUntil, int copies, Double pickProbability, Integer pickOrder) {
        this(round, position, row, score, spotCheck, predictionJson, leasedTo, leaseUntil, copies, pickProbability,
                pickOrder, false);
    }

    /** A place of a round's batch read back where its place among the round's picks is not needed. */
    public QueueEntry(int round, int position, long row, double score, boolean spotCheck, String predictionJson,
                      String leasedTo, Instant leaseUntil, int copies, Double pickProbability) {
        this(round, position, row, score, spotCheck, predictionJson, leasedTo, leaseUntil, copies, pickProbability,
                null, false);
    }

    public QueueEntry(int round, int position, long row, double score, boolean spotCheck, String predictionJson,
                      String leasedTo, Instant leaseUntil, int copies) {
        this(round, position, row, score, spotCheck, predictionJson, leasedTo, leaseUntil, copies, null, null, false);
    }

    /** An entry that one person labels. */
    public QueueEntry(int round, int position, long row, double score, boolean spotCheck, String predictionJson,
                      String leasedTo, Instant leaseUntil) {
        this(round, position, row, score, spotCheck, predictionJson, leasedTo, leaseUntil, 1, null, null, false);
    }

    public QueueEntry withCopies(int n) {
        return new QueueEntry(round, position, row, score, spotCheck, predictionJson, leasedTo, leaseUntil, n,
                pickProbability, pickOrder, reserve);
    }
}
