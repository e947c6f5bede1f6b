package dev.dowser.web;

import static dev.dowser.web.Requests.jsonBody;
import static dev.dowser.web.Requests.param;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.desk.Desk;
import dev.dowser.desk.Overview;
import dev.dowser.desk.QueuePlace;
import dev.dowser.json.Json;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.store.QueueEntry;
import dev.dowser.store.RoundStore;
import dev.dowser.team.Role;
import io.undertow.server.HttpServerExchange;
import java.io.IOException;
import java.util.List;

/** What the overview shows of a pool's rounds: their list and chain health, the served queue, settings. */
final class RoundsApi {

    private final Overview overview;
    private final Desk desk;

    RoundsApi(Overview overview, Desk desk) {
        this.overview = overview;
        this.desk = desk;
    }

    /** The rounds, newest first, {@code limit} from {@code offset}, with how many there are. */
    void list(HttpServerExchange ex) {
        Overview.RoundsPage page = overview.rounds(param(ex, "pool"),
                Requests.intQuery(ex, "offset", 0, 0, Integer.MAX_VALUE),
                Requests.intQuery(ex, "limit", Overview.MAX_ROUNDS_PAGE, 1, Overview.MAX_ROUNDS_PAGE));
        ArrayNode out = Json.array();
        for (Overview.RoundLine line : page.rounds()) {
            RoundStore.RoundRow r = line.round();
            ObjectNode n = out.addObject().put("round", r.round()).put("status", r.status().word())
                    .put("started_at", r.startedAt().toString()).put("finished_at", Views.time(r.finishedAt()))
                    .put("labels_at_start", r.labelsAtStart()).put("kernel", r.kernel()).put("message", r.message());
            if (r.finishedAt() != null) {
                n.put("seconds", (r.finishedAt().toEpochMilli() - r.startedAt().toEpochMilli()) / 1000.0);
            }
            if (line.chains() != null) {
                n.set("health", Json.tree(r.healthJson()));
                AdviceApi.chains(n.putObject("advice"), line.chains());
            }
        }
        ObjectNode body = Json.object().put("total", page.total()).put("offset", page.offset())
                .put("limit", page.limit());
        body.set("rounds", out);
        if (page.progress().servedRound() != null) {
            body.put("served_round", page.progress().servedRound());
        }
        body.put("labels_to_next_round", page.progress().labelsToNextRound());
        Responses.ok(ex, body);
    }

    void request(HttpServerExchange ex) {
        overview.requestRound(param(ex, "pool"));
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
                    .put("reserve", e.reserve())
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
        Responses.ok(ex, settingsJson(overview.settings(param(ex, "pool"))));
    }

    /** Changes some of the settings; fields not named keep their value, unknown fields are refused. */
    void changeSettings(HttpServerExchange ex) throws IOException {
        PoolSettings.Change change = PoolSettings.Change.parse(jsonBody(ex, "a settings change"));
        Responses.ok(ex, settingsJson(overview.changeSettings(param(ex, "pool"), change,
                Gate.caller(ex, true).name())));
    }

    /** Every change of the pool's settings, oldest first: who, when, before and after. */
    void settingsHistory(HttpServerExchange ex) {
        ArrayNode changes = Json.array();
        for (Overview.SettingsChange c : overview.settingsHistory(param(ex, "pool"))) {
            ObjectNode n = changes.addObject().put("by", c.by()).put("at", c.at().toString());
            n.set("before", c.before() == null ? null : settingsJson(c.before()));
            n.set("after", settingsJson(c.after()));
        }
        Responses.ok(ex, Json.object().set("changes", changes));
    }

    /** The settings' one document, with chains, draws, re-burn-in and temperature as in force (the pool's own or the server's). */
    private static ObjectNode settingsJson(Overview.Settings in) {
        return in.settings().shown(in.sampling());
    }
}
