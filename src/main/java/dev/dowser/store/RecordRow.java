package dev.dowser.store;

import dev.dowser.labels.LabelRow;
import java.time.Instant;
import java.util.Arrays;
import java.util.Collections;
import java.util.List;

/**
 * One record as a person sees it: its place in the pool, its id, the line it came from, its
 * display values (null for missing) and its current label, if any ({@code label} and the fields
 * after it are null when it has none).
 */
public record RecordRow(long row, String key, long sourceLine, List<String> display, String label,
                        String labelledBy, Instant labelledAt, String note) {

    public RecordRow {
        display = Collections.unmodifiableList(Arrays.asList(display.toArray(new String[0])));
    }

    public boolean labelled() {
        return label != null;
    }

    RecordRow withLabel(LabelRow l) {
        return l == null ? this : new RecordRow(row, key, sourceLine, display, l.label(), l.labelledBy(),
                l.labelledAt(), l.note());
    }
}
