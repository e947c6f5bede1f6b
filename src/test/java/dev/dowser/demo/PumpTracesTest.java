package dev.dowser.demo;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.data.ImportResult;
import dev.dowser.store.Database;
import java.io.IOException;
import java.io.StringWriter;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The invented demo: deterministic from its seed, with every condition present, and loadable as a pool. */
class PumpTracesTest {

    @TempDir
    Path dir;

    private static String csv(int n, long seed) throws IOException {
        StringWriter w = new StringWriter();
        PumpTraces.write(w, n, seed);
        return w.toString();
    }

    @Test
    void sameSeedSameReadings() throws IOException {
        assertEquals(csv(200, 7), csv(200, 7));
        assertNotEquals(csv(200, 7), csv(200, 8));
    }

    @Test
    void everyConditionAppearsNearItsShare() throws IOException {
        Map<String, Integer> counts = new HashMap<>();
        String[] lines = csv(5_000, 7).split("\r\n");
        for (int i = 1; i < lines.length; i++) {
            String condition = lines[i].substring(lines[i].lastIndexOf(',') + 1);
            counts.merge(condition, 1, Integer::sum);
        }
        for (int c = 0; c < PumpTraces.CONDITIONS.size(); c++) {
            double share = counts.get(PumpTraces.CONDITIONS.get(c)) / 5_000.0;
            // Binomial SD at n = 5000 is at most 0.007; 0.03 is over four of them.
            assertEquals(PumpTraces.CONDITION_SHARE[c], share, 0.03, PumpTraces.CONDITIONS.get(c));
        }
    }

    @Test
    void loadsAsAnUnlabelledPoolWithTheFiveConditions() {
        try (Database db = TestSupport.openDb(dir)) {
            ImportResult r = DemoPool.load(db, dir, 500, DemoPool.DEFAULT_SEED);
            assertEquals(500, r.records());
            assertEquals(0, r.labelled());
            assertEquals(PumpTraces.CONDITIONS, db.pools().require(DemoPool.POOL).classes());
            // station one-hot (4), rpm, flow with its missing indicator, 64 trace values.
            assertEquals(4 + 1 + 2 + PumpTraces.TRACE_SAMPLES, r.features());
            assertTrue(dir.resolve(DemoPool.FILE).toFile().isFile());
        }
    }
}
