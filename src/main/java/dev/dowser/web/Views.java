package dev.dowser.web;

import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.desk.Progress;
import dev.dowser.desk.RecordView;
import dev.dowser.json.Json;
import java.time.Instant;
import java.util.List;

/** The JSON shapes that several calls share: a record and the desk's progress line. */
final class Views {

    private Views() {
    }

    /** A record: id, place, source line, display fields by name, and its final label with who, when and why. */
    static ObjectNode record(RecordView r) {
        ObjectNode n = Json.object().put("id", r.id()).put("row", r.row()).put("line", r.line());
        ObjectNode fields = n.putObject("fields");
        r.fields().forEach(fields::put);
        return n.put("label", r.label()).put("labelled_by", r.labelledBy()).put("labelled_at", time(r.labelledAt()))
                .put("note", r.note());
    }

    /** A record as the desk shows it: nobody's label. */
    static ObjectNode unlabelledRecord(RecordView r) {
        ObjectNode n = record(r);
        n.remove(List.of("label", "labelled_by", "labelled_at", "note"));
        return n;
    }

    /** Puts the progress line of the desk into {@code body} as {@code progress}. */
    static ObjectNode progress(ObjectNode body, Progress p) {
        ObjectNode n = body.putObject("progress");
        if (p.servedRound() == null) {
            n.putNull("served_round");
        } else {
            n.put("served_round", p.servedRound());
        }
        n.put("labels_to_next_round", p.labelsToNextRound());
        return body;
    }

    /** An instant as ISO 8601 text, or null. */
    static String time(Instant at) {
        return at == null ? null : at.toString();
    }

    /** A number, or null for NaN (no value yet). */
    static void number(ObjectNode n, String field, double v) {
        if (Double.isNaN(v)) {
            n.putNull(field);
        } else {
            n.put(field, v);
        }
    }
}
