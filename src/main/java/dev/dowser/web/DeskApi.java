package dev.dowser.web;

import static dev.dowser.web.Requests.jsonBody;
import static dev.dowser.web.Requests.optionalText;
import static dev.dowser.web.Requests.param;
import static dev.dowser.web.Requests.requiredInt;
import static dev.dowser.web.Requests.requiredText;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.json.Json;
import dev.dowser.labels.LabelRow;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.RoundWorker;
import dev.dowser.rounds.Rounds;
import dev.dowser.store.Database;
import dev.dowser.store.LabelStore;
import dev.dowser.store.PoolRow;
import dev.dowser.store.QueueEntry;
import dev.dowser.store.RecordRow;
import io.undertow.server.HttpServerExchange;
import io.undertow.server.RoutingHandler;
import java.io.IOException;
import java.time.Duration;
import java.util.List;
import java.util.Optional;

/**
 * The labelling desk's calls: take the next record (under a lease), give a label, skip, and take
 * the last label back. Labels never wait for a round: the worker only hears that one was added.
 */
final class DeskApi {

    private final Database db;
    private final Rounds rounds;
    private final Events events;

    DeskApi(Database db, Rounds rounds, Events events) {
        this.db = db;
        this.rounds = rounds;
        this.events = events;
    }

    void addTo(RoutingHandler routes) {
        routes.post("/pools/{pool}/queue/next", this::next)
                .post("/pools/{pool}/queue/skip", this::skip)
                .post("/pools/{pool}/labels", this::label)
                .post("/pools/{pool}/labels/undo", this::undo);
    }

    /** Leases the next record of the served queue to the signed-in person. */
    private void next(HttpServerExchange ex) throws IOException {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        String person = Gate.caller(ex, true).name();
        Optional<QueueEntry> next = db.queues().lease(pool.id(), person, lease(pool));
        if (next.isEmpty()) {
            ObjectNode body = Json.object().putNull("record").put("message",
                    "nothing to label in the served queue; the next round will bring more");
            progress(body, pool);
            Responses.ok(ex, body);
            return;
        }
        QueueEntry e = next.get();
        RecordRow r = db.records().page(pool.id(), e.row(), 1).get(0);
        ObjectNode body = Json.object().put("round", e.round()).put("position", e.position())
                .put("copies", e.copies()).put("spot_check", e.spotCheck()).put("score", e.score()).put("lease_until", e.leaseUntil().toString());
        // Another person's label is not shown: a second labeller must judge on their own.
        ObjectNode record = Api.recordJson(r, Api.display(pool));
        record.remove(List.of("label", "labelled_by", "labelled_at", "note"));
        body.set("record", record);
        if (e.predictionJson() != null) {
            // Sent for spot checks too; the desk keeps it hidden there unless asked, so they stay an honest test.
            JsonNode belief = Json.tree(e.predictionJson());
            body.set("belief", belief.isArray() ? Json.object().set("mean", belief) : belief);
        }
        progress(body, pool);
        Responses.ok(ex, body);
    }

    /** Gives the record back to the queue at once, for the next person. */
    private void skip(HttpServerExchange ex) throws IOException {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        JsonNode body = jsonBody(ex, "a skip");
        db.queues().release(pool.id(), requiredInt(body, "round"), requiredInt(body, "position"),
                Gate.caller(ex, true).name());
        Responses.ok(ex, Json.object().put("released", true));
    }

    private void label(HttpServerExchange ex) throws IOException {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        JsonNode body = jsonBody(ex, "a label request");
        String record = requiredText(body, "record");
        String label = requiredText(body, "label");
        String by = Gate.caller(ex, true).name();
        String note = optionalText(body, "note");
        if (note != null && note.length() > LabelStore.MAX_NOTE_CHARS) {
            throw new ApiException(400, "field 'note' may hold at most " + LabelStore.MAX_NOTE_CHARS + " characters");
        }
        if (note != null && note.isBlank()) {
            note = null;
        }
        pool.checkClass(label);
        long row = Api.rowOf(db, pool, record);
        db.labels().add(pool.id(), row, label, by, note);
        RoundWorker worker = rounds.worker(pool.name());
        worker.labelAdded();
        events.labelChanged(pool.name(), record, "added", worker.labelsToNextRound());
        RecordRow r = db.records().page(pool.id(), row, 1).get(0);
        ObjectNode out = Api.recordJson(r, Api.display(pool));
        progress(out, pool);
        Responses.json(ex, 201, out);
    }

    /** Takes back the person's label of a record; the record returns to them if the served queue holds it. */
    private void undo(HttpServerExchange ex) throws IOException {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        JsonNode body = jsonBody(ex, "an undo");
        String record = requiredText(body, "record");
        String person = Gate.caller(ex, true).name();
        long row = Api.rowOf(db, pool, record);
        LabelRow withdrawn = db.labels().withdraw(pool.id(), row, person);
        db.queues().leaseRow(pool.id(), row, person, lease(pool));
        RoundWorker worker = rounds.worker(pool.name());
        worker.labelWithdrawn();
        events.labelChanged(pool.name(), record, "withdrawn", worker.labelsToNextRound());
        RecordRow r = db.records().page(pool.id(), row, 1).get(0);
        ObjectNode out = Json.object().put("withdrawn", withdrawn.label());
        out.set("record", Api.recordJson(r, Api.display(pool)));
        progress(out, pool);
        Responses.ok(ex, out);
    }

    /** The small progress line of the desk: the served round and labels until the next. */
    private void progress(ObjectNode body, PoolRow pool) {
        ObjectNode p = body.putObject("progress");
        db.queues().servedRound(pool.id()).ifPresentOrElse(round -> p.put("served_round", round),
                () -> p.putNull("served_round"));
        p.put("labels_to_next_round", rounds.worker(pool.name()).labelsToNextRound());
    }

    private static Duration lease(PoolRow pool) {
        return Duration.ofMinutes(PoolSettings.parse(pool.settingsJson()).leaseMinutes());
    }
}
