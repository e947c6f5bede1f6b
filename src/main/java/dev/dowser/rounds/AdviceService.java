package dev.dowser.rounds;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.advice.AccuracyReport;
import dev.dowser.advice.ChainAdvice;
import dev.dowser.data.QueuedBelief;
import dev.dowser.json.Json;
import dev.dowser.labels.LabelRow;
import dev.dowser.stats.Metrics;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import dev.dowser.store.QueueStore;
import dev.dowser.store.RoundStore;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * What a pool's overview and desk say about the model, read from the database: the accuracy
 * report and the keep-labelling card ({@link AccuracyReport}), and each round's chain health in
 * plain words ({@link ChainAdvice}).
 */
public final class AdviceService {

    private final Database db;

    public AdviceService(Database db) {
        this.db = db;
    }

    /** The accuracy report with its card, and the calibration error over every labelled spot check (NaN if none). */
    public record Report(AccuracyReport accuracy, double ece, List<RoundStore.Evidence> rounds) {
    }

    public Report report(String poolName) {
        PoolRow pool = db.pools().require(poolName);
        PoolSettings settings = PoolSettings.parse(pool.settingsJson());
        List<String> classes = pool.classes();
        Map<Long, Integer> finals = new HashMap<>();
        db.labels().forEachResolution(pool.id(), r -> {
            LabelRow f = r.finalLabel();
            int k = f == null ? -1 : classes.indexOf(f.label());
            if (k >= 0) {
                finals.put(r.row(), k);
            }
        });
        List<RoundStore.Evidence> evidence = db.rounds().evidence(pool.id());
        List<AccuracyReport.Round> rounds = new ArrayList<>();
        for (RoundStore.Evidence e : evidence) {
            rounds.add(new AccuracyReport.Round(e.round(), e.labelsAtStart(), e.settled().candidates(),
                    e.settled().agreement()));
        }
        List<AccuracyReport.Scored> scored = new ArrayList<>();
        List<double[]> checkBelief = new ArrayList<>();
        List<Integer> checkLabel = new ArrayList<>();
        for (QueueStore.Picked p : db.queues().picks(pool.id())) {
            if (p.predictionJson() == null) {
                continue;
            }
            double[] mean = QueuedBelief.parse(p.predictionJson()).mean();
            if (mean.length != classes.size()) {
                continue;
            }
            Integer given = finals.get(p.row());
            Boolean right = given == null ? null : argmax(mean) == given;
            scored.add(new AccuracyReport.Scored(p.round(), p.order(), p.probability(), p.spotCheck(), right));
            if (p.spotCheck() && given != null) {
                checkBelief.add(mean);
                checkLabel.add(given);
            }
        }
        AccuracyReport report = AccuracyReport.of(rounds, scored, settings.stopRule());
        return new Report(report, ece(checkBelief, checkLabel, classes.size()), evidence);
    }

    /** A round's chain health in plain words, for the draws and chains it kept and the sampling in force now. */
    public static ChainAdvice chains(String healthJson, String samplerJson, PoolSettings.Sampling now) {
        JsonNode h = Json.tree(healthJson);
        JsonNode kept = samplerJson == null ? Json.object() : Json.tree(samplerJson);
        ChainAdvice.Knobs knobs = new ChainAdvice.Knobs(now.chains(), now.draws(), now.reburnInSteps(),
                PoolSettings.Sampling.MAX_CHAINS, PoolSettings.Sampling.MAX_DRAWS,
                PoolSettings.Sampling.MAX_REBURN_IN_STEPS);
        // Rounds saved before the within-chain figures existed lack them: NaN, and the advice reads as it did.
        return ChainAdvice.of(number(h, "rhatMax"), number(h, "essBulkMin"), number(h, "essTailMin"),
                number(h, "rhatWithinMax"), number(h, "essWithinMin"), kept.path("chains").asInt(now.chains()), kept.path("draws").asInt(now.draws()), knobs);
    }

    private static double number(JsonNode n, String field) {
        JsonNode v = n.path(field);
        return v.isNumber() ? v.asDouble() : Double.NaN;
    }

    private static int argmax(double[] p) {
        int best = 0;
        for (int k = 1; k < p.length; k++) {
            if (p[k] > p[best]) {
                best = k;
            }
        }
        return best;
    }

    private static double ece(List<double[]> beliefs, List<Integer> given, int classes) {
        if (beliefs.isEmpty()) {
            return Double.NaN;
        }
        float[] p = new float[beliefs.size() * classes];
        int[] y = new int[beliefs.size()];
        for (int i = 0; i < y.length; i++) {
            for (int k = 0; k < classes; k++) {
                p[i * classes + k] = (float) beliefs.get(i)[k];
            }
            y[i] = given.get(i);
        }
        return Metrics.ece(p, y, classes);
    }
}
