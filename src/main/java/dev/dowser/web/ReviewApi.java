package dev.dowser.web;

import static dev.dowser.web.Requests.jsonBody;
import static dev.dowser.web.Requests.optionalText;
import static dev.dowser.web.Requests.param;
import static dev.dowser.web.Requests.requiredText;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.desk.RecordView;
import dev.dowser.json.Json;
import dev.dowser.labels.Resolution;
import dev.dowser.labels.Verdict;
import dev.dowser.store.LabelStore;
import dev.dowser.team.Agreement;
import dev.dowser.team.Reviews;
import io.undertow.server.HttpServerExchange;
import java.io.IOException;

/** The review page's calls: filtered labelled records, a record's history, decisions, and agreement. */
final class ReviewApi {

    private final Reviews reviews;

    ReviewApi(Reviews reviews) {
        this.reviews = reviews;
    }

    void list(HttpServerExchange ex) {
        Reviews.Filter filter = new Reviews.Filter(Reviews.Show.parse(Requests.query(ex, "show", "all")),
                Requests.query(ex, "labeller", null), Requests.query(ex, "label", null));
        int offset = (int) Requests.longQuery(ex, "offset", 0);
        int limit = (int) Requests.longQuery(ex, "limit", Requests.DEFAULT_PAGE);
        Reviews.Page page = reviews.find(param(ex, "pool"), filter, offset, limit);
        ArrayNode items = Json.array();
        for (Reviews.Item item : page.items()) {
            ObjectNode n = Views.record(RecordView.of(item.record(), page.display()));
            resolutionJson(n, item.resolution());
            n.put("spot_check", item.spotCheck());
            if (item.model() != null) {
                ArrayNode m = n.putArray("model");
                for (double p : item.model()) {
                    m.add(p);
                }
            }
            items.add(n);
        }
        ObjectNode body = Json.object().put("total", page.total()).put("offset", offset).put("limit", limit)
                .put("confident", Reviews.CONFIDENT);
        body.set("records", items);
        body.set("people", Json.mapper().valueToTree(page.people()));
        Responses.ok(ex, body);
    }

    /** Accept or override: {"record": id, "verdict": "accept"|"override", "label": ..., "reason": ...}. */
    void decide(HttpServerExchange ex) throws IOException {
        JsonNode body = jsonBody(ex, "a review");
        String record = requiredText(body, "record");
        String word = requiredText(body, "verdict");
        Verdict verdict;
        try {
            verdict = Verdict.parse(word);
        } catch (IllegalArgumentException e) {
            throw new ApiException(400, "field 'verdict' must be accept or override, got '" + word + "'");
        }
        Resolution r = reviews.decide(param(ex, "pool"), record, Gate.caller(ex, true), verdict,
                optionalText(body, "label"), optionalText(body, "reason"));
        ObjectNode out = Json.object().put("record", record);
        resolutionJson(out, r);
        Responses.json(ex, 201, out);
    }

    void history(HttpServerExchange ex) {
        String record = param(ex, "record");
        ArrayNode entries = Json.array();
        for (LabelStore.Entry e : reviews.history(param(ex, "pool"), record)) {
            entries.addObject().put("kind", e.withdrawn() ? "withdrawal" : e.kind()).put("label", e.label())
                    .put("by", e.by()).put("at", e.at().toString()).put("note", e.note());
        }
        Responses.ok(ex, Json.object().put("record", record).set("history", entries));
    }

    void agreement(HttpServerExchange ex) {
        Agreement a = reviews.agreement(param(ex, "pool"));
        ObjectNode body = Json.object().put("records", a.records());
        Views.number(body, "fleiss_kappa", a.fleiss());
        ArrayNode pairs = body.putArray("pairs");
        for (Agreement.Pair p : a.pairs()) {
            Views.number(pairs.addObject().put("first", p.first()).put("second", p.second())
                    .put("records", p.records()), "cohen_kappa", p.kappa());
        }
        body.set("classes", Json.mapper().valueToTree(a.classes()));
        body.set("confusion", Json.mapper().valueToTree(a.confusion()));
        Responses.ok(ex, body);
    }

    static void resolutionJson(ObjectNode n, Resolution r) {
        n.put("status", r.status().word());
        var fin = r.finalLabel();
        n.put("final_label", fin == null ? null : fin.label()).put("decided_by", fin == null ? null : fin.labelledBy());
        ArrayNode ops = n.putArray("opinions");
        for (Resolution.Opinion o : r.opinions()) {
            ops.addObject().put("person", o.person()).put("label", o.label()).put("at", o.at().toString())
                    .put("note", o.note());
        }
        if (r.review() != null) {
            n.putObject("review").put("reviewer", r.review().reviewer()).put("verdict", r.review().verdict().word())
                    .put("label", r.review().label()).put("reason", r.review().reason())
                    .put("at", r.review().at().toString());
        }
    }
}
