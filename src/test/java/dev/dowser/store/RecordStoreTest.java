package dev.dowser.store;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;

import dev.dowser.TestSupport;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Reading many scattered records at once: in the order asked, with their final labels, across blocks. */
class RecordStoreTest {

    @TempDir
    Path dir;

    @Test
    void scatteredRowsComeBackInTheOrderAskedWithTheirLabels() {
        try (Database db = TestSupport.openDb(dir)) {
            int n = PoolWriter.BLOCK_MAX_ROWS * 2 + 3;
            StringBuilder csv = new StringBuilder("id,x\n");
            for (int i = 0; i < n; i++) {
                csv.append("r").append(i).append(',').append(i % 7).append('\n');
            }
            TestSupport.importText(db, "p", csv.toString(), TestSupport.csv("p").withId("id")
                    .withClasses(List.of("a", "b")));
            PoolRow pool = db.pools().require("p");
            long last = n - 1;
            db.labels().add(pool.id(), last, "b", "ana", "far end");
            db.labels().add(pool.id(), 5, "a", "ben", null);
            // Rows from three blocks, out of order, one twice; one cached before and one not.
            db.records().warm(pool.id(), new long[] {5});
            long[] asked = {last, 5, PoolWriter.BLOCK_MAX_ROWS + 1, 0, 5};
            List<RecordRow> rows = db.records().rows(pool.id(), asked);
            assertEquals(List.of("r" + last, "r5", "r" + (PoolWriter.BLOCK_MAX_ROWS + 1), "r0", "r5"),
                    rows.stream().map(RecordRow::key).toList());
            assertEquals("b", rows.get(0).label());
            assertEquals("far end", rows.get(0).note());
            assertEquals("a", rows.get(1).label());
            assertNull(rows.get(2).label());
            assertEquals(String.valueOf(last % 7), rows.get(0).display().get(0));
            assertEquals(List.of(), db.records().rows(pool.id(), new long[0]));
            NotFoundException none = assertThrows(NotFoundException.class,
                    () -> db.records().requireRow(pool, "zzz"));
            assertEquals("no record 'zzz' in pool 'p'", none.getMessage());
        }
    }
}
