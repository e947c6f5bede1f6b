package dev.dowser.labels;

import java.time.Instant;

/** One stored label of a record, by its place in the pool. */
public record LabelRow(long row, String label, String labelledBy, Instant labelledAt, String note) {
}
