package dev.dowser.desk;

import dev.dowser.store.RecordRow;
import java.time.Instant;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * One record as a page shows it: its id, place and source line, its display fields by column
 * name (in the pool's order; null for a missing value), and its final label with who gave it,
 * when and why ({@code label} and the fields after it are null while it has none).
 */
public record RecordView(String id, long row, long line, Map<String, String> fields, String label, String labelledBy,
                         Instant labelledAt, String note) {

    public RecordView {
        fields = Collections.unmodifiableMap(new LinkedHashMap<>(fields));
    }

    /** The record {@code r} of a pool whose display columns are {@code display}. */
    public static RecordView of(RecordRow r, List<String> display) {
        Map<String, String> fields = new LinkedHashMap<>();
        for (int i = 0; i < display.size(); i++) {
            fields.put(display.get(i), r.display().get(i));
        }
        return new RecordView(r.key(), r.row(), r.sourceLine(), fields, r.label(), r.labelledBy(), r.labelledAt(),
                r.note());
    }

    /** The same record without its label: the desk shows nobody's label, so a second labeller judges alone. */
    public RecordView unlabelled() {
        return new RecordView(id, row, line, fields, null, null, null, null);
    }
}
