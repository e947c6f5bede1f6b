package dev.dowser.desk;

import dev.dowser.store.QueueEntry;

/**
 * One place of the served queue as the overview lists it: the entry (score, spot check, copies,
 * lease, reserve), its record's id, whether it is done, whether one of its two people labelled it
 * and the second is awaited, and its final label (null when hidden or none).
 */
public record QueuePlace(QueueEntry entry, String record, boolean done, boolean awaitingSecondLabel, String label) {
}
