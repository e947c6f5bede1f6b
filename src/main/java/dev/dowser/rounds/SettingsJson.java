package dev.dowser.rounds;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.acquire.ColdStart;
import dev.dowser.json.Json;
import dev.dowser.sampler.SamplerConfig;
import java.util.Iterator;
import java.util.List;

/**
 * The one JSON form of a pool's settings, in the API's names: kept with the pool, with each round and
 * in the settings history, and sent and taken by the API and the settings form. Documents stored
 * before V12 used the code's camelCase names; that migration renamed their fields.
 */
final class SettingsJson {

    static final String BATCH_SIZE = "batch_size";
    static final String SPOT_CHECK_SHARE = "spot_check_share";
    static final String LEASE_MINUTES = "lease_minutes";
    static final String STRATEGY = "strategy";
    static final String DOUBLE_LABEL_SHARE = "double_label_share";
    static final String CHAINS = "chains";
    static final String DRAWS = "draws";
    static final String REBURN_IN_STEPS = "reburn_in_steps";
    static final String TEMPERATURE = "temperature";
    static final String STOP_AGREEMENT = "stop_agreement";
    static final String COLD_START = "cold_start";

    /** Every field, in the order the document and the refusal of an unknown field list them. */
    static final List<String> FIELDS = List.of(BATCH_SIZE, SPOT_CHECK_SHARE, LEASE_MINUTES, STRATEGY,
            DOUBLE_LABEL_SHARE, STOP_AGREEMENT, COLD_START, CHAINS, DRAWS, REBURN_IN_STEPS, TEMPERATURE);

    private SettingsJson() {
    }

    /** The document of {@code s} with {@code sampling}'s fields, or without them when it is null. */
    static ObjectNode write(PoolSettings s, PoolSettings.Sampling sampling) {
        ObjectNode n = Json.object().put(BATCH_SIZE, s.batchSize()).put(SPOT_CHECK_SHARE, s.spotCheckShare())
                .put(LEASE_MINUTES, s.leaseMinutes()).put(STRATEGY, s.strategy().word())
                .put(DOUBLE_LABEL_SHARE, s.doubleLabelShare()).put(STOP_AGREEMENT, s.stopAgreement())
                .put(COLD_START, s.coldStart().word());
        if (sampling != null) {
            n.put(CHAINS, sampling.chains()).put(DRAWS, sampling.draws())
                    .put(REBURN_IN_STEPS, sampling.reburnInSteps()).put(TEMPERATURE, sampling.temperature());
        }
        return n;
    }

    /**
     * A stored document: a missing field takes its default. The pool's own sampling is kept whole or not
     * at all; one saved before temperature was a setting takes the default temperature.
     */
    static PoolSettings read(String json) {
        JsonNode n = Json.tree(json == null || json.isBlank() ? "{}" : json);
        PoolSettings d = PoolSettings.defaults();
        PoolSettings.Sampling sampling = n.has(DRAWS) ? new PoolSettings.Sampling(n.path(CHAINS).asInt(),
                n.path(DRAWS).asInt(), n.path(REBURN_IN_STEPS).asInt(),
                n.path(TEMPERATURE).asDouble(SamplerConfig.DEFAULT_TEMPERATURE)) : null;
        return new PoolSettings(n.path(BATCH_SIZE).asInt(d.batchSize()),
                n.path(SPOT_CHECK_SHARE).asDouble(d.spotCheckShare()), n.path(LEASE_MINUTES).asInt(d.leaseMinutes()),
                n.has(STRATEGY) ? Strategy.parse(n.get(STRATEGY).asText()) : d.strategy(),
                n.path(DOUBLE_LABEL_SHARE).asDouble(d.doubleLabelShare()), sampling,
                n.path(STOP_AGREEMENT).asDouble(d.stopAgreement()),
                n.has(COLD_START) ? ColdStart.Method.parse(n.get(COLD_START).asText()) : d.coldStart());
    }

    /** A change as a person sends it: the fields named, each of its type; an unknown field is refused. */
    static PoolSettings.Change readChange(JsonNode body) {
        if (body == null || !body.isObject()) {
            throw new IllegalArgumentException("a settings change must be a JSON object of the settings to change");
        }
        for (Iterator<String> it = body.fieldNames(); it.hasNext(); ) {
            String field = it.next();
            if (!FIELDS.contains(field)) {
                throw new IllegalArgumentException("unknown setting '" + field + "'; the settings are "
                        + String.join(", ", FIELDS));
            }
        }
        String strategy = Json.text(body, STRATEGY);
        String coldStart = Json.text(body, COLD_START);
        return new PoolSettings.Change(Json.wholeNumber(body, BATCH_SIZE), Json.number(body, SPOT_CHECK_SHARE),
                Json.wholeNumber(body, LEASE_MINUTES), strategy == null ? null : Strategy.parse(strategy),
                Json.number(body, DOUBLE_LABEL_SHARE), Json.wholeNumber(body, CHAINS), Json.wholeNumber(body, DRAWS),
                Json.wholeNumber(body, REBURN_IN_STEPS), Json.number(body, STOP_AGREEMENT),
                Json.number(body, TEMPERATURE), coldStart == null ? null : ColdStart.Method.parse(coldStart));
    }
}
