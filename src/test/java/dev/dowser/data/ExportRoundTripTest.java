package dev.dowser.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
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

    @Test
    void csvRoundTripKeepsIdsAndLabels() {
        roundTrip(FileFormat.CSV);
    }

    @Test
    void jsonLinesRoundTripKeepsIdsAndLabels() {
        roundTrip(FileFormat.JSONL);
    }

    private void roundTrip(FileFormat format) {
        try (Database db = TestSupport.openDb(dir)) {
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
