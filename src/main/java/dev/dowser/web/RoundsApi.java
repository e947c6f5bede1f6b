package dev.dowser.web;

import static dev.dowser.web.Requests.jsonBody;
import static dev.dowser.web.Requests.param;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.json.Json;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Rounds;
import dev.dowser.rounds.SpotCheckAccuracy;
import dev.dowser.rounds.Strategy;
import dev.dowser.store.Database;
import dev.dowser.store.HistoryStore;
import dev.dowser.store.PoolRow;
import dev.dowser.store.QueueEntry;
import dev.dowser.store.QueueStore;
import dev.dowser.store.RecordRow;
import dev.dowser.store.RoundStore;
import dev.dowser.team.Role;
import io.undertow.server.HttpServerExchange;
import io.undertow.server.RoutingHandler;
import java.io.IOException;
import java.util.Iterator;
import java.util.List;
import java.util.Map;

/** What the overview shows of a pool's rounds: their list and health, the served queue, spot-check accuracy, settings. */
final class RoundsApi {

    private final Database db;
    private final Rounds rounds;

    RoundsApi(Database db, Rounds rounds) {
        this.db = db;
        this.rounds = rounds;
    }

    void addTo(RoutingHandler routes) {
        routes.get("/pools/{pool}/rounds", this::list)
                .post("/pools/{pool}/rounds", this::request)
                .get("/pools/{pool}/queue", this::queue)
                .get("/pools/{pool}/accuracy", this::accuracy)
                .get("/pools/{pool}/settings", this::settings)
                .put("/pools/{pool}/settings", this::changeSettings)
                .get("/pools/{pool}/settings/history", this::settingsHistory);
    }

    private void list(HttpServerExchange ex) {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        ArrayNode out = Json.array();
        for (RoundStore.RoundRow r : db.rounds().list(pool.id())) {
            ObjectNode n = out.addObject().put("round", r.round()).put("status", r.status())
                    .put("started_at", r.startedAt().toString())
                    .put("finished_at", r.finishedAt() == null ? null : r.finishedAt().toString())
                    .put("labels_at_start", r.labelsAtStart()).put("kernel", r.kernel()).put("message", r.message());
            if (r.finishedAt() != null) {
                n.put("seconds", (r.finishedAt().toEpochMilli() - r.startedAt().toEpochMilli()) / 1000.0);
            }
            if (r.healthJson() != null) {
                n.set("health", Json.tree(r.healthJson()));
            }
        }
        ObjectNode body = Json.object();
        body.set("rounds", out);
        db.queues().servedRound(pool.id()).ifPresent(round -> body.put("served_round", round));
        body.put("labels_to_next_round", rounds.worker(pool.name()).labelsToNextRound());
        Responses.ok(ex, body);
    }

    private void request(HttpServerExchange ex) {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        rounds.worker(pool.name()).request();
        Responses.json(ex, 202, Json.object().put("requested", true));
    }

    /** The served queue; labels are left out for labellers, so that a second labeller judges alone. */
    private void queue(HttpServerExchange ex) {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        boolean showLabels = Gate.caller(ex, true).role().atLeast(Role.REVIEWER);
        ArrayNode entries = Json.array();
        List<QueueStore.Served> served = db.queues().served(pool.id());
        db.records().warm(pool.id(), served.stream().mapToLong(s -> s.entry().row()).toArray());
        for (QueueStore.Served s : served) {
            QueueEntry e = s.entry();
            RecordRow r = db.records().page(pool.id(), e.row(), 1).get(0);
            entries.addObject().put("position", e.position()).put("record", r.key()).put("score", e.score())
                    .put("spot_check", e.spotCheck()).put("copies", e.copies()).put("labelled", s.labelled())
                    .put("label", showLabels ? r.label() : null)
                    .put("leased_to", e.leasedTo())
                    .put("lease_until", e.leaseUntil() == null ? null : e.leaseUntil().toString());
        }
        ObjectNode body = Json.object();
        db.queues().servedRound(pool.id()).ifPresent(round -> body.put("round", round));
        body.set("entries", entries);
        Responses.ok(ex, body);
    }

    private void accuracy(HttpServerExchange ex) {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        SpotCheckAccuracy.Report report = SpotCheckAccuracy.of(db, pool);
        ArrayNode points = Json.array();
        for (SpotCheckAccuracy.Point p : report.points()) {
            points.addObject().put("labels", p.labels()).put("checked", p.checked()).put("correct", p.correct())
                    .put("accuracy", p.accuracy()).put("lower", p.lower()).put("upper", p.upper());
        }
        ObjectNode body = Json.object();
        body.set("points", points);
        SpotCheckAccuracy.Point last = report.last();
        if (last != null) {
            body.put("checked", last.checked()).put("accuracy", last.accuracy()).put("lower", last.lower())
                    .put("upper", last.upper()).put("ece", report.ece());
        } else {
            body.put("checked", 0);
        }
        Responses.ok(ex, body);
    }

    private void settings(HttpServerExchange ex) {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        Responses.ok(ex, settingsJson(PoolSettings.parse(pool.settingsJson())));
    }

    /** Changes some of the settings; fields not named keep their value, unknown fields are refused. */
    private void changeSettings(HttpServerExchange ex) throws IOException {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        JsonNode body = jsonBody(ex, "a settings change");
        PoolSettings now = PoolSettings.parse(pool.settingsJson());
        for (Iterator<Map.Entry<String, JsonNode>> it = body.fields(); it.hasNext(); ) {
            String field = it.next().getKey();
            if (!field.equals("batch_size") && !field.equals("spot_check_share") && !field.equals("lease_minutes")
                    && !field.equals("strategy") && !field.equals("double_label_share")) {
                throw new ApiException(400, "unknown setting '" + field + "'; the settings are batch_size,"
                        + " spot_check_share, lease_minutes, strategy and double_label_share");
            }
        }
        PoolSettings next = new PoolSettings(Requests.optionalInt(body, "batch_size", now.batchSize()),
                Requests.optionalNumber(body, "spot_check_share", now.spotCheckShare()),
                Requests.optionalInt(body, "lease_minutes", now.leaseMinutes()),
                body.has("strategy") ? Strategy.parse(body.get("strategy").asText()) : now.strategy(),
                Requests.optionalNumber(body, "double_label_share", now.doubleLabelShare()));
        db.pools().updateSettings(pool.id(), next.toJson(), Gate.caller(ex, true).name());
        rounds.worker(pool.name()).batchChanged(next.batchSize());
        Responses.ok(ex, settingsJson(next));
    }

    /** Every change of the pool's settings, oldest first: who, when, before and after. */
    private void settingsHistory(HttpServerExchange ex) {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        ArrayNode changes = Json.array();
        for (HistoryStore.Change c : db.history().of(pool.id(), "settings")) {
            ObjectNode n = changes.addObject().put("by", c.actor()).put("at", c.at().toString());
            n.set("before", c.before() == null ? null : settingsJson(PoolSettings.parse(c.before())));
            n.set("after", settingsJson(PoolSettings.parse(c.after())));
        }
        Responses.ok(ex, Json.object().set("changes", changes));
    }

    private static ObjectNode settingsJson(PoolSettings s) {
        return Json.object().put("batch_size", s.batchSize()).put("spot_check_share", s.spotCheckShare())
                .put("lease_minutes", s.leaseMinutes()).put("strategy", s.strategy().word())
                .put("double_label_share", s.doubleLabelShare());
    }
}
