package dev.dowser.rounds;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.acquire.ColdStart;
import dev.dowser.json.Json;
import dev.dowser.sampler.SamplerConfig;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/** The pool settings' one document: what is kept is what the API shows and takes, every field included. */
class SettingsJsonTest {

    /** A document in the API's names, as the renaming migration leaves an old row (MigrationTest). */
    static final String KEPT = "{\"batch_size\":4,\"spot_check_share\":0.2,\"lease_minutes\":15,\"strategy\":\"bald\","
            + "\"double_label_share\":0.0,\"stop_agreement\":0.95,\"cold_start\":\"typiclust\",\"chains\":2,"
            + "\"draws\":8,\"reburn_in_steps\":50,\"temperature\":0.5}";

    private static final PoolSettings EVERY_FIELD_CHANGED = new PoolSettings(4, 0.2, 15, Strategy.BALD, 0.0,
            new PoolSettings.Sampling(2, 8, 50, 0.5), 0.95, ColdStart.Method.TYPICLUST);

    @Test
    void aKeptDocumentReadsWithEverySetting() {
        assertEquals(EVERY_FIELD_CHANGED, PoolSettings.parse(KEPT));
        assertEquals(KEPT, EVERY_FIELD_CHANGED.toJson(), "written as it is read, field for field");
    }

    @Test
    void theKeptDocumentIsTheOneTheApiShowsAndTakes() {
        PoolSettings.Sampling server = PoolSettings.Sampling.of(SamplerConfig.builder().build());
        PoolSettings following = PoolSettings.defaults();
        JsonNode shown = following.shown(server);
        assertEquals(SettingsJson.FIELDS, fields(shown), "the API shows every setting, cold start included");
        assertEquals(fields(Json.tree(following.toJson())), SettingsJson.FIELDS.subList(0, 7),
                "a pool following the server's sampler keeps no sampling of its own");
        assertNull(PoolSettings.parse(following.toJson()).sampling());

        // What the API shows, sent back whole as a change, changes nothing but fixing the sampling in force.
        PoolSettings.Change same = PoolSettings.Change.parse(shown);
        assertEquals(new PoolSettings(following.batchSize(), following.spotCheckShare(), following.leaseMinutes(),
                following.strategy(), following.doubleLabelShare(), server, following.stopAgreement(),
                following.coldStart()), same.applyTo(following, SamplerConfig.builder().build()));

        PoolSettings.Change every = PoolSettings.Change.parse(Json.tree(KEPT));
        assertEquals(EVERY_FIELD_CHANGED, every.applyTo(following, SamplerConfig.builder().build()));
        assertEquals(Json.tree(KEPT), EVERY_FIELD_CHANGED.shown(EVERY_FIELD_CHANGED.sampling()));
    }

    @Test
    void aMissingFieldTakesItsDefault() {
        assertEquals(PoolSettings.defaults(), PoolSettings.parse("{}"));
        assertEquals(PoolSettings.defaults(), PoolSettings.parse(null));
        // A pool's own sampling kept before temperature was a setting samples at the default temperature.
        assertEquals(SamplerConfig.DEFAULT_TEMPERATURE,
                PoolSettings.parse("{\"chains\":2,\"draws\":8,\"reburn_in_steps\":50}").sampling().temperature());
    }

    @Test
    void aChangeIsRefusedInTheDocumentsWords() {
        assertEquals("unknown setting 'batchSize'; the settings are batch_size, spot_check_share, lease_minutes,"
                        + " strategy, double_label_share, stop_agreement, cold_start, chains, draws, reburn_in_steps,"
                        + " temperature",
                refusal("{\"batchSize\":4}"));
        assertEquals("field 'lease_minutes' must be a whole number, got \"ten\"", refusal("{\"lease_minutes\":\"ten\"}"));
        assertEquals("field 'temperature' must be a number, got true", refusal("{\"temperature\":true}"));
        assertEquals("field 'cold_start' must be a string, got 3", refusal("{\"cold_start\":3}"));
        assertEquals("unknown cold start 'middle': use kmeans++ or typiclust", refusal("{\"cold_start\":\"middle\"}"));
        assertEquals("a settings change must be a JSON object of the settings to change", refusal("[1]"));
    }

    private static String refusal(String body) {
        return assertThrows(IllegalArgumentException.class, () -> PoolSettings.Change.parse(Json.tree(body)))
                .getMessage();
    }

    private static List<String> fields(JsonNode n) {
        List<String> out = new ArrayList<>();
        n.fieldNames().forEachRemaining(out::add);
        return out;
    }
}
