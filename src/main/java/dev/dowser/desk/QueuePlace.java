package dev.dowser.desk;

import dev.dowser.store.QueueEntry;

/**
 * One place of the served queue as the overview lists it: the entry (score, spot check, copies,
 * lease), its record's id, whether it is done, whether one person has labelled it and it waits for
 * a second, and its final label (null when hidden or none).
 */
public record QueuePlace(QueueEntry entry, String record, boolean done, boolean waitingForSecond, String label) {

    /** Whether the entry has a score: the first batch is picked before any model, so it has none. */
    public boolean scored() {
        return entry.predictionJson() != null;
    }
}
