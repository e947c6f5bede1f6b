package dev.dowser.store;

import java.time.Instant;

/** One place in a served queue: the record, why it was picked, and who holds it until when. */
public record QueueEntry(int round, int position, long row, double score, boolean spotCheck, String predictionJson,
                         String leasedTo, Instant leaseUntil) {
}
