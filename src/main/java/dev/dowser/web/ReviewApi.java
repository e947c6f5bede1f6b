package dev.dowser.web;

import static dev.dowser.web.Requests.jsonBody;
import static dev.dowser.web.Requests.optionalText;
import static dev.dowser.web.Requests.param;
import static dev.dowser.web.Requests.requiredText;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.json.Json;
import dev.dowser.labels.Resolution;
import dev.dowser.store.Database;
import dev.dowser.store.LabelStore;
import dev.dowser.store.PoolRow;
import dev.dowser.store.RecordRow;
import dev.dowser.team.Agreement;
import dev.dowser.team.Reviews;
import io.undertow.server.HttpServerExchange;
import io.undertow.server.RoutingHandler;
import java.io.IOException;
import java.util.List;

/** The review page's calls: filtered labelled records, a record's history, decisions, and agreement. */
final class ReviewApi {

    private final Database db;
    private final Reviews reviews;

    ReviewApi(Database db) {
        this.db = db;
        this.reviews = new Reviews(db);
    }

    void addTo(RoutingHandler routes) {
        routes.get("/pools/{pool}/review", this::list)
                .post("/pools/{pool}/reviews", this::decide)
                .get("/pools/{pool}/records/{record}/history", this::history)
                .get("/pools/{pool}/agreement", this::agreement);
    }

    private void list(HttpServerExchange ex) {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        Reviews.Filter filter = new Reviews.Filter(Reviews.Show.parse(Requests.query(ex, "show", "all")),
                Requests.query(ex, "labeller", null), Requests.query(ex, "label", null));
        int offset = (int) Requests.longQuery(ex, "offset", 0);
        int limit = (int) Requests.longQuery(ex, "limit", Api.DEFAULT_PAGE);
        Reviews.Page page = reviews.find(pool, filter, offset, limit);
        List<String> display = Api.display(pool);
        ArrayNode items = Json.array();
        db.records().warm(pool.id(), page.items().stream().mapToLong(i -> i.resolution().row()).toArray());
        for (Reviews.Item item : page.items()) {
            RecordRow r = db.records().page(pool.id(), item.resolution().row(), 1).get(0);
            ObjectNode n = Api.recordJson(r, display);
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
        body.set("people", Json.tree(Json.write(page.people())));
        Responses.ok(ex, body);
    }

    /** Accept or override: {"record": id, "verdict": "accept"|"override", "label": ..., "reason": ...}. */
    private void decide(HttpServerExchange ex) throws IOException {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        JsonNode body = jsonBody(ex, "a review");
        String record = requiredText(body, "record");
        String verdict = requiredText(body, "verdict");
        if (!verdict.equals(LabelStore.KIND_ACCEPT) && !verdict.equals(LabelStore.KIND_OVERRIDE)) {
            throw new ApiException(400, "field 'verdict' must be accept or override, got '" + verdict + "'");
        }
        long row = Api.rowOf(db, pool, record);
        Resolution r = reviews.decide(pool, row, Gate.caller(ex, true), verdict, optionalText(body, "label"),
                optionalText(body, "reason"));
        ObjectNode out = Json.object().put("record", record);
        resolutionJson(out, r);
        Responses.json(ex, 201, out);
    }

    private void history(HttpServerExchange ex) {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        String record = param(ex, "record");
        ArrayNode entries = Json.array();
        for (LabelStore.Entry e : db.labels().history(pool.id(), Api.rowOf(db, pool, record))) {
            entries.addObject().put("kind", e.withdrawn() ? "withdrawal" : e.kind()).put("label", e.label())
                    .put("by", e.by()).put("at", e.at().toString()).put("note", e.note());
        }
        Responses.ok(ex, Json.object().put("record", record).set("history", entries));
    }

    private void agreement(HttpServerExchange ex) {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        Agreement a = reviews.agreement(pool);
        ObjectNode body = Json.object().put("records", a.records());
        putNumber(body, "fleiss_kappa", a.fleiss());
        ArrayNode pairs = body.putArray("pairs");
        for (Agreement.Pair p : a.pairs()) {
            putNumber(pairs.addObject().put("first", p.first()).put("second", p.second()).put("records", p.records()),
                    "cohen_kappa", p.kappa());
        }
        body.set("classes", Json.tree(Json.write(a.classes())));
        body.set("confusion", Json.tree(Json.write(a.confusion())));
        Responses.ok(ex, body);
    }

    private static void putNumber(ObjectNode n, String field, double v) {
        if (Double.isNaN(v)) {
            n.putNull(field);
        } else {
            n.put(field, v);
        }
    }

    static void resolutionJson(ObjectNode n, Resolution r) {
        n.put("status", r.status());
        var fin = r.finalLabel();
        n.put("final_label", fin == null ? null : fin.label()).put("decided_by", fin == null ? null : fin.labelledBy());
        ArrayNode ops = n.putArray("opinions");
        for (Resolution.Opinion o : r.opinions()) {
            ops.addObject().put("person", o.person()).put("label", o.label()).put("at", o.at().toString())
                    .put("note", o.note());
        }
        if (r.review() != null) {
            n.putObject("review").put("reviewer", r.review().reviewer()).put("verdict", r.review().verdict())
                    .put("label", r.review().label()).put("reason", r.review().reason())
                    .put("at", r.review().at().toString());
        }
    }
}
