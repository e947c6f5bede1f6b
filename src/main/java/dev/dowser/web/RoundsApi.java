package dev.dowser.web;

import static dev.dowser.web.Requests.jsonBody;
import static dev.dowser.web.Requests.param;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.desk.Desk;
import dev.dowser.desk.Progress;
import dev.dowser.desk.QueuePlace;
import dev.dowser.json.Json;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.RoundWorkers;
import dev.dowser.rounds.Strategy;
import dev.dowser.store.Database;
import dev.dowser.store.HistoryStore;
import dev.dowser.store.PoolRow;
import dev.dowser.store.QueueEntry;
import dev.dowser.store.RoundStore;
import dev.dowser.team.Role;
import io.undertow.server.HttpServerExchange;
import java.io.IOException;
import java.util.Iterator;
import java.util.List;
import java.util.Map;

/** What the overview shows of a pool's rounds: their list and chain health, the served queue, settings. */
final class RoundsApi {

    static final List<String> SETTINGS = List.of("batch_size", "spot_check_share", "lease_minutes", "strategy",
            "double_label_share", "chains", "draws", "reburn_in_steps", "stop_agreement");

    /** Most rounds in one answer; older ones are paged. */
    static final int MAX_ROUNDS_PAGE = 200;

    private final Database db;
    private final RoundWorkers rounds;
    private final Desk desk;

    RoundsApi(Database db, RoundWorkers rounds, Desk desk) {
        this.db = db;
        this.rounds = rounds;
        this.desk = desk;
    }

    /** The rounds, newest first, {@code limit} from {@code offset}, with how many there are. */
    void list(HttpServerExchange ex) {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        PoolSettings settings = PoolSettings.parse(pool.settingsJson());
        int offset = (int) Requests.longQuery(ex, "offset", 0);
        int limit = (int) Requests.longQuery(ex, "limit", MAX_ROUNDS_PAGE);
        if (offset < 0 || limit < 1 || limit > MAX_ROUNDS_PAGE) {
            throw new ApiException(400, "offset must be 0 or more and limit 1 to " + MAX_ROUNDS_PAGE);
        }
        List<RoundStore.RoundRow> all = db.rounds().list(pool.id());
        ArrayNode out = Json.array();
        for (RoundStore.RoundRow r : all.subList(Math.min(offset, all.size()), Math.min(all.size(), offset + limit))) {
            ObjectNode n = out.addObject().put("round", r.round()).put("status", r.status())
                    .put("started_at", r.startedAt().toString()).put("finished_at", Views.time(r.finishedAt()))
                    .put("labels_at_start", r.labelsAtStart()).put("kernel", r.kernel()).put("message", r.message());
            if (r.finishedAt() != null) {
                n.put("seconds", (r.finishedAt().toEpochMilli() - r.startedAt().toEpochMilli()) / 1000.0);
            }
            if (r.healthJson() != null) {
                n.set("health", Json.tree(r.healthJson()));
                AdviceApi.chains(n.putObject("advice"), r.healthJson(), r.samplerJson(),
                        settings.sampling(rounds.sampler()));
            }
        }
        ObjectNode body = Json.object().put("total", all.size()).put("offset", offset).put("limit", limit);
        body.set("rounds", out);
        Progress p = desk.progress(pool.name());
        if (p.servedRound() != null) {
            body.put("served_round", p.servedRound());
        }
        body.put("labels_to_next_round", p.labelsToNextRound());
        Responses.ok(ex, body);
    }

    void request(HttpServerExchange ex) {
        rounds.worker(db.pools().require(param(ex, "pool")).name()).request();
        Responses.json(ex, 202, Json.object().put("requested", true));
    }

    /** The served queue; labels are left out for labellers, so that a second labeller judges alone. */
    void queue(HttpServerExchange ex) {
        boolean showLabels = Gate.caller(ex, true).role().atLeast(Role.REVIEWER);
        List<QueuePlace> served = desk.served(param(ex, "pool"), showLabels);
        ArrayNode entries = Json.array();
        for (QueuePlace place : served) {
            QueueEntry e = place.entry();
            entries.addObject().put("position", e.position()).put("record", place.record()).put("score", e.score())
                    .put("scored", place.scored()).put("spot_check", e.spotCheck()).put("copies", e.copies())
                    .put("labelled", place.done()).put("waiting_for_second", place.waitingForSecond())
                    .put("label", place.label()).put("leased_to", e.leasedTo())
                    .put("lease_until", Views.time(e.leaseUntil()));
        }
        ObjectNode body = Json.object();
        if (!served.isEmpty()) {
            body.put("round", served.get(0).entry().round());
        }
        body.set("entries", entries);
        Responses.ok(ex, body);
    }

    void settings(HttpServerExchange ex) {
        Responses.ok(ex, settingsJson(PoolSettings.parse(db.pools().require(param(ex, "pool")).settingsJson())));
    }

    /** Changes some of the settings; fields not named keep their value, unknown fields are refused. */
    void changeSettings(HttpServerExchange ex) throws IOException {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        JsonNode body = jsonBody(ex, "a settings change");
        for (Iterator<Map.Entry<String, JsonNode>> it = body.fields(); it.hasNext(); ) {
            String field = it.next().getKey();
            if (!SETTINGS.contains(field)) {
                throw new ApiException(400, "unknown setting '" + field + "'; the settings are "
                        + String.join(", ", SETTINGS));
            }
        }
        PoolSettings now = PoolSettings.parse(pool.settingsJson());
        PoolSettings.Sampling sampling = now.sampling(rounds.sampler());
        boolean ownSampling = body.has("chains") || body.has("draws") || body.has("reburn_in_steps");
        PoolSettings next = new PoolSettings(Requests.optionalInt(body, "batch_size", now.batchSize()),
                Requests.optionalNumber(body, "spot_check_share", now.spotCheckShare()),
                Requests.optionalInt(body, "lease_minutes", now.leaseMinutes()),
                body.has("strategy") ? Strategy.parse(body.get("strategy").asText()) : now.strategy(),
                Requests.optionalNumber(body, "double_label_share", now.doubleLabelShare()),
                ownSampling ? new PoolSettings.Sampling(Requests.optionalInt(body, "chains", sampling.chains()),
                        Requests.optionalInt(body, "draws", sampling.draws()),
                        Requests.optionalInt(body, "reburn_in_steps", sampling.reburnInSteps())) : now.sampling(),
                Requests.optionalNumber(body, "stop_agreement", now.stopAgreement()));
        Responses.ok(ex, settingsJson(rounds.changeSettings(pool.name(), next, Gate.caller(ex, true).name())));
    }

    /** Every change of the pool's settings, oldest first: who, when, before and after. */
    void settingsHistory(HttpServerExchange ex) {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        ArrayNode changes = Json.array();
        for (HistoryStore.Change c : db.history().of(pool.id(), "settings")) {
            ObjectNode n = changes.addObject().put("by", c.actor()).put("at", c.at().toString());
            n.set("before", c.before() == null ? null : settingsJson(PoolSettings.parse(c.before())));
            n.set("after", settingsJson(PoolSettings.parse(c.after())));
        }
        Responses.ok(ex, Json.object().set("changes", changes));
    }

    /** The settings as the API names them; chains, draws and re-burn-in as in force (the pool's own or the server's). */
    private ObjectNode settingsJson(PoolSettings s) {
        PoolSettings.Sampling sampling = s.sampling(rounds.sampler());
        return Json.object().put("batch_size", s.batchSize()).put("spot_check_share", s.spotCheckShare())
                .put("lease_minutes", s.leaseMinutes()).put("strategy", s.strategy().word())
                .put("double_label_share", s.doubleLabelShare()).put("chains", sampling.chains())
                .put("draws", sampling.draws()).put("reburn_in_steps", sampling.reburnInSteps())
                .put("stop_agreement", s.stopAgreement());
    }
}
