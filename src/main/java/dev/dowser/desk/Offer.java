package dev.dowser.desk;

import dev.dowser.data.QueuedBelief;
import java.time.Instant;

/**
 * What the desk is handed when a person asks for the next record: the queued record leased to
 * them (its round and place in the queue, how many people label it, whether it is a spot check,
 * its score, the lease's end and the model's belief at queue time; {@code belief} may be null), with
 * {@code reason}, why it is shown, in plain words, and whether it is a {@code secondOpinion} (someone
 * else has labelled it); or, when nothing is left for them, no record and a message saying why.
 * Either way, the progress line.
 */
public record Offer(int round, int position, int copies, boolean spotCheck, double score, Instant leaseUntil,
                    RecordView record, QueuedBelief belief, String reason, boolean secondOpinion, Progress progress,
                    String message) {

    /** Nothing to label for this person now. */
    static Offer none(String message, Progress progress) {
        return new Offer(0, 0, 0, false, 0, null, null, null, null, false, progress, message);
    }

    public boolean empty() {
        return record == null;
    }
}
