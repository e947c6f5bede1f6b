package dev.dowser.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.TestSupport;
import dev.dowser.json.Json;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import dev.dowser.store.QueueEntry;
import dev.dowser.store.RecordRow;
import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Export, then import the export: the same ids with the same labels, in CSV and in JSON Lines. */
class ExportRoundTripTest {

    /** Awkward on purpose: quotes, commas, line breaks, spaces, non-ASCII, a display column named "label". */
    static final String SOURCE = "key,text,label,value,grade\n"
            + "k1,\"plain\",\"she said \"\"hi\"\"\",1.5,ok\n"
            + "k2,\"a, b\",x,2,bad\n"
            + "k3,\"two\nlines\",y,,ok\n"
            + "k 4,\" spaced \",z,4,\n"
            + "k5,Ünïcödé ✓,w,5,bad\n";

    @TempDir
    Path dir;

    /** The database of the data folder {@code data}: an H2 file here, a PostgreSQL server in {@code ExportRoundTripOnPostgresqlTest}. */
    Database database(Path data) {
        return TestSupport.openDb(data);
    }

    @Test
    void csvRoundTripKeepsIdsAndLabels() {
        roundTrip(FileFormat.CSV);
    }

    @Test
    void jsonLinesRoundTripKeepsIdsAndLabels() {
        roundTrip(FileFormat.JSONL);
    }

    private void roundTrip(FileFormat format) {
        try (Database db = database(dir)) {
            ImportSpec spec = TestSupport.csv("src").withId("key").withLabel("grade").withFeatures(List.of("value"))
                    .withDisplay(List.of("text", "label", "value"));
            TestSupport.importText(db, "src", SOURCE, spec);
            PoolRow pool = db.pools().require("src");
            // A person labels k4, which had none; another disagrees with the file's label of k5, which
            // leaves k5 unresolved: exported with no final label but with both people's labels.
            db.labels().add(pool.id(), db.records().rowOf(pool.id(), "k5").orElseThrow(), "ok", "ana", "checked");
            db.labels().add(pool.id(), db.records().rowOf(pool.id(), "k 4").orElseThrow(), "bad", "ben", null);

            ByteArrayOutputStream out = new ByteArrayOutputStream();
            long n = new Exporter(db).export("src", format, out);
            assertEquals(5, n);

            ImportSpec back = ImportSpec.defaults("back", format).withId(Exporter.ID).withLabel(Exporter.LABEL)
                    .withFeatures(List.of("value"));
            new Importer(db).run(new ByteArrayInputStream(out.toByteArray()), "export", back, ImportProgress.NONE);
            assertEquals(labels(db, "src"), labels(db, "back"));
            assertEquals(Map.of("k1", "ok", "k2", "bad", "k3", "ok", "k 4", "bad"), labels(db, "back"));
            // Display text survives too, quotes and line breaks included; the colliding name is prefixed.
            RecordRow k3 = db.records().find(db.pools().require("back").id(), "k3").orElseThrow();
            String text = new String(out.toByteArray(), StandardCharsets.UTF_8);
            assertEquals(true, text.contains(Exporter.RENAMED_PREFIX + "label"));
            assertEquals("two\nlines", k3.display().get(0));
            assertTrue(text.contains("unresolved"), text);
            assertTrue(text.contains("ana") && text.contains("checked"), text);
        }
    }

    @Test
    void jsonLinesKeepsTypesAndWhereEachRecordCameFrom() {
        try (Database db = database(dir)) {
            TestSupport.importText(db, "typed", "id,reading,trace,code\n"
                    + "a,1.5,\"[0.5,-1,2e3]\",007\nb,-2,\"[1,2,3]\",x1\nc,3,\"[0,0,0]\",12\n",
                    TestSupport.csv("typed").withId("id").withClasses(List.of("ok", "fault"))
                            .withFeatures(List.of("reading", "trace")));
            PoolRow pool = db.pools().require("typed");
            // Round 1 queued a (a spot check) and b, with the model's belief at the time; c was never queued.
            db.queues().publish(pool.id(), 1, List.of(
                    new QueueEntry(1, 0, 0, 0.2, true, QueuedBelief.write(new float[] {0.8f, 0.2f}, new float[] {0.1f, 0.1f}),
                            null, null),
                    new QueueEntry(1, 1, 1, 0.6, false, QueuedBelief.write(new float[] {0.3f, 0.7f}, new float[] {0.2f, 0.2f}),
                            null, null)));
            db.labels().add(pool.id(), 0, "fault", "ana", null);
            db.labels().add(pool.id(), 1, "fault", "ben", null);
            db.labels().add(pool.id(), 2, "ok", "ana", null);
            ByteArrayOutputStream out = new ByteArrayOutputStream();
            new Exporter(db).export("typed", FileFormat.JSONL, out);
            List<JsonNode> lines = new String(out.toByteArray(), StandardCharsets.UTF_8).lines().map(Json::tree).toList();
            JsonNode a = lines.get(0);
            assertTrue(a.get("reading").isNumber() && a.get("reading").asDouble() == 1.5, a.toString());
            assertTrue(a.get("trace").isArray() && a.get("trace").get(2).asDouble() == 2000, "a trace is an array of numbers: " + a);
            assertEquals("007", a.get("code").asText(), "leading zeros are text: an id, not a number");
            assertTrue(a.get("code").isTextual());
            assertEquals("{\"ana\":\"fault\"}", a.get("labels_by_person").toString());
            assertEquals(1, a.get("round").asInt());
            assertTrue(a.get("spot_check").isBoolean() && a.get("spot_check").asBoolean());
            assertEquals("ok", a.get("model_label").asText(), "the model then favoured ok");
            assertEquals(0.2, a.get("model_probability").asDouble(), 1e-6, "and gave the final label fault 0.2");
            JsonNode b = lines.get(1);
            assertEquals(-2, b.get("reading").asInt());
            assertFalse(b.get("spot_check").asBoolean());
            assertEquals(0.7, b.get("model_probability").asDouble(), 1e-6);
            JsonNode c = lines.get(2);
            assertTrue(c.get("round").isNull() && c.get("spot_check").isNull() && c.get("model_probability").isNull(), c.toString());
            assertEquals(12, c.get("code").asInt());

            ObjectNode meta = new Exporter(db).metadata("typed");
            assertEquals("[{\"name\":\"ok\",\"key\":\"1\",\"labelled\":1},{\"name\":\"fault\",\"key\":\"2\",\"labelled\":2}]",
                    meta.get("classes").toString());
            assertTrue(meta.at("/fields/model_probability").asText().contains("final label"));
        }
    }

    private static Map<String, String> labels(Database db, String pool) {
        Map<String, String> out = new LinkedHashMap<>();
        db.records().forEachLabelled(db.pools().require(pool).id(), (r, resolution) -> {
            if (r.labelled()) {
                out.put(r.key(), r.label());
            }
        });
        return out;
    }
}
