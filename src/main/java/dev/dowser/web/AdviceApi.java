package dev.dowser.web;

import static dev.dowser.web.Requests.param;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.advice.AccuracyReport;
import dev.dowser.advice.ChainAdvice;
import dev.dowser.rounds.AdviceService;
import dev.dowser.advice.StopAdvice;
import dev.dowser.json.Json;
import dev.dowser.stats.AccuracyEstimate;
import dev.dowser.stats.LearningCurve;
import dev.dowser.store.RoundStore;
import io.undertow.server.HttpServerExchange;

/** How good the model is and whether more labels pay: the accuracy report and the keep-labelling card. */
final class AdviceApi {

    /** Projections of the learning curve, this many labels past today's. */
    static final int[] MORE_LABELS = {100, 500, 1000};

    private final AdviceService advice;

    AdviceApi(AdviceService advice) {
        this.advice = advice;
    }

    void accuracy(HttpServerExchange ex) {
        AdviceService.Report r = advice.report(param(ex, "pool"));
        AccuracyReport a = r.accuracy();
        ObjectNode body = Json.object();
        if (a.modelRound() > 0) {
            body.putObject("model").put("round", a.modelRound()).put("labels", a.modelLabels());
            body.putObject("window").put("from_round", a.firstRound()).put("to_round", a.modelRound());
        }
        estimate(body.putObject("picked"), a.picked());
        estimate(body.putObject("spot_checks"), a.checked())
                .put("more_for_5_points", a.checked().moreChecksFor(AccuracyEstimate.TARGET_HALF_WIDTH));
        ArrayNode rounds = body.putArray("rounds");
        for (AccuracyReport.RoundEstimate e : a.perRound()) {
            estimate(rounds.addObject().put("round", e.round()).put("model_labels", e.labels())
                    .put("from", e.weighted() ? "picks" : "spot_checks"), e.accuracy());
        }
        LearningCurve curve = a.curve();
        if (curve == null) {
            body.putNull("curve");
        } else {
            ObjectNode c = body.putObject("curve").put("a", curve.a()).put("b", curve.b()).put("c", curve.c());
            long now = a.modelLabels();
            projection(c.putObject("gain_per_100"), curve.gain(now, 100), false);
            ArrayNode projections = c.putArray("projections");
            for (int more : MORE_LABELS) {
                projection(projections.addObject().put("more", more), curve.project(now + more), true);
            }
        }
        Views.number(body, "ece", r.ece());
        Responses.ok(ex, body);
    }

    /** The keep-labelling card, with the agreement and information left that it rests on. */
    void advice(HttpServerExchange ex) {
        String pool = param(ex, "pool");
        AdviceService.Report r = advice.report(pool);
        StopAdvice card = r.accuracy().advice();
        ObjectNode body = Json.object().put("state", card.state().word()).put("headline", card.headline());
        ArrayNode details = body.putArray("details");
        card.details().forEach(details::add);
        ArrayNode agreement = body.putArray("agreement");
        ArrayNode information = body.putArray("information");
        for (RoundStore.Evidence e : r.rounds()) {
            ObjectNode k = agreement.addObject().put("round", e.round()).put("labels", e.labelsAtStart())
                    .put("records", e.settled().compared());
            Views.number(k, "kappa", e.settled().agreement());
            information.addObject().put("round", e.round()).put("labels", e.labelsAtStart())
                    .put("total", e.settled().information()).put("top", e.settled().informationTop());
        }
        Responses.ok(ex, body);
    }

    /** A round's chain health in plain words, as the rounds list shows it. */
    static ObjectNode chains(ObjectNode n, ChainAdvice c) {
        n.put("level", c.level().word()).put("summary", c.summary()).put("rhat_ceiling", c.rhatCeiling())
                .put("ess_floor", c.essFloor());
        ArrayNode points = n.putArray("points");
        for (ChainAdvice.Point p : c.points()) {
            ObjectNode o = points.addObject().put("text", p.text()).put("setting", p.setting());
            if (p.setting() != null) {
                o.put("suggest", p.suggest());
            }
        }
        return n;
    }

    private static ObjectNode estimate(ObjectNode n, AccuracyEstimate e) {
        n.put("labels", e.labels());
        if (e.known()) {
            n.put("accuracy", e.accuracy()).put("lower", e.lower()).put("upper", e.upper()).put("worth", e.worth());
        }
        return n;
    }

    /** A projection or a gain; an accuracy and its interval are kept within 0 to 1, where the truth lies. */
    private static void projection(ObjectNode n, LearningCurve.Projection p, boolean accuracy) {
        Views.number(n, "accuracy", accuracy ? clip(p.accuracy()) : p.accuracy());
        Views.number(n, "lower", accuracy ? clip(p.lower()) : p.lower());
        Views.number(n, "upper", accuracy ? clip(p.upper()) : p.upper());
    }

    private static double clip(double v) {
        return Double.isNaN(v) ? v : Math.max(0, Math.min(1, v));
    }
}
