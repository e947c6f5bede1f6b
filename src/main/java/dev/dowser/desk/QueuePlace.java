package dev.dowser.desk;

import dev.dowser.store.QueueEntry;

/**
 * One place of the served queue as the overview lists it: the entry (score, spot check, copies,
 * lease), its record's id, whether it is done, and its final label (null when hidden or none).
 */
public record QueuePlace(QueueEntry entry, String record, boolean done, String label) {
}
