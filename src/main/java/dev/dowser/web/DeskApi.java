package dev.dowser.web;

import dev.dowser.data.QueuedBelief;
import static dev.dowser.web.Requests.jsonBody;
import static dev.dowser.web.Requests.optionalText;
import static dev.dowser.web.Requests.param;
import static dev.dowser.web.Requests.requiredInt;
import static dev.dowser.web.Requests.requiredText;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.desk.Desk;
import dev.dowser.desk.Offer;
import dev.dowser.json.Json;
import dev.dowser.team.Caller;
import dev.dowser.team.Role;
import io.undertow.server.HttpServerExchange;
import java.io.IOException;

/** The labelling desk's calls: take the next record (under a lease), give a label, skip, take a label back. */
final class DeskApi {

    private final Desk desk;

    DeskApi(Desk desk) {
        this.desk = desk;
    }

    /** Leases the next record of the served queue to the signed-in person. */
    void next(HttpServerExchange ex) {
        Caller caller = Gate.caller(ex, true);
        Offer o = desk.next(param(ex, "pool"), caller.name(), caller.role().atLeast(Role.REVIEWER));
        ObjectNode body = Json.object();
        if (o.empty()) {
            body.putNull("record").put("message", o.message());
        } else {
            body.put("round", o.round()).put("position", o.position()).put("copies", o.copies())
                    .put("spot_check", o.spotCheck()).put("score", o.score())
                    .put("lease_until", Views.time(o.leaseUntil())).put("reason", o.reason())
                    .put("second_opinion", o.secondOpinion());
            body.set("record", Views.unlabelledRecord(o.record()));
            if (o.belief() != null) {
                body.set("belief", belief(o.belief()));
            }
        }
        Responses.ok(ex, Views.progress(body, o.progress()));
    }

    /** Gives the record back to the queue at once; it is not offered to this person again while anything else is open. */
    void skip(HttpServerExchange ex) throws IOException {
        JsonNode body = jsonBody(ex, "a skip");
        desk.skip(param(ex, "pool"), Gate.caller(ex, true).name(), requiredInt(body, "round"),
                requiredInt(body, "position"));
        Responses.ok(ex, Json.object().put("released", true));
    }

    /** Gives the record back to the queue at once, as when the desk's page closes; anyone may get it next. */
    void release(HttpServerExchange ex) throws IOException {
        JsonNode body = jsonBody(ex, "a release");
        desk.release(param(ex, "pool"), Gate.caller(ex, true).name(), requiredInt(body, "round"),
                requiredInt(body, "position"));
        Responses.ok(ex, Json.object().put("released", true));
    }

    void label(HttpServerExchange ex) throws IOException {
        JsonNode body = jsonBody(ex, "a label request");
        Desk.Labelled l = desk.label(param(ex, "pool"), Gate.caller(ex, true).name(), requiredText(body, "record"),
                requiredText(body, "label"), optionalText(body, "note"));
        Responses.json(ex, 201, Views.progress(Views.record(l.record()), l.progress()));
    }

    /** Takes back the person's label of a record. */
    void undo(HttpServerExchange ex) throws IOException {
        JsonNode body = jsonBody(ex, "an undo");
        Desk.Withdrawn w = desk.undo(param(ex, "pool"), Gate.caller(ex, true).name(), requiredText(body, "record"));
        ObjectNode out = Json.object().put("withdrawn", w.label());
        out.set("record", Views.record(w.record()));
        Responses.ok(ex, Views.progress(out, w.progress()));
    }

    /** The signed-in person's latest labels that still stand, newest first. */
    void mine(HttpServerExchange ex) {
        ArrayNode list = Json.array();
        for (Desk.Given g : desk.recent(param(ex, "pool"), Gate.caller(ex, true).name())) {
            list.addObject().put("record", g.record()).put("label", g.label()).put("at", Views.time(g.at()));
        }
        Responses.ok(ex, Json.object().set("labels", list));
    }

    private static ObjectNode belief(QueuedBelief b) {
        ObjectNode n = Json.object();
        ArrayNode mean = n.putArray("mean");
        for (double v : b.mean()) {
            mean.add(v);
        }
        if (b.sd().length > 0) {
            ArrayNode sd = n.putArray("sd");
            for (double v : b.sd()) {
                sd.add(v);
            }
        }
        return n;
    }
}
