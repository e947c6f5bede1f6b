package dev.dowser.store;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.data.ImportException;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** All or nothing across many blocks, and ids repeated far apart are still caught. */
class PoolWriterTest {

    @TempDir
    Path dir;

    private static String rows(int n, int repeatAt) {
        StringBuilder s = new StringBuilder("id,x\n");
        for (int i = 0; i < n; i++) {
            s.append(i == repeatAt ? "id0" : "id" + i).append(',').append(i % 97).append('\n');
        }
        return s.toString();
    }

    @Test
    void manyBlocksCommitTogether() {
        try (Database db = TestSupport.openDb(dir)) {
            int n = PoolWriter.BLOCK_MAX_ROWS * 3 + 5;
            TestSupport.importText(db, "big", rows(n, -1), TestSupport.csv("big").withId("id"));
            PoolRow pool = db.pools().require("big");
            assertEquals(n, pool.recordCount());
            List<RecordRow> tail = db.records().page(pool.id(), n - 2, 2);
            assertEquals(List.of("id" + (n - 2), "id" + (n - 1)), tail.stream().map(RecordRow::key).toList());
            long[] seen = {0};
            db.records().forEachFeatures(pool.id(), (row, bytes, off, len) -> {
                assertEquals(seen[0]++, row);
                assertEquals(4, len);
            });
            assertEquals(n, seen[0]);
            assertEquals(n - 1L, db.records().rowOf(pool.id(), "id" + (n - 1)).orElseThrow());
        }
    }

    @Test
    void aRepeatInALaterBlockRollsEverythingBack() {
        try (Database db = TestSupport.openDb(dir)) {
            Map<String, Long> before = TestSupport.tableCounts(dir);
            int n = PoolWriter.BLOCK_MAX_ROWS * 2 + 10;
            ImportException e = assertThrows(ImportException.class, () -> TestSupport.importText(db, "big",
                    rows(n, n - 3), TestSupport.csv("big").withId("id")));
            assertEquals("line " + (n - 1) + ", column 'id': duplicate id 'id0' (first seen on line 2);"
                    + " every record needs its own id", e.getMessage());
            assertEquals(before, TestSupport.tableCounts(dir));
            assertTrue(db.pools().find("big").isEmpty());
        }
    }

    @Test
    void poolNamesAreChecked() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> PoolWriter.checkName("no spaces"));
        assertEquals("pool name 'no spaces' is not allowed: use 1 to 100 letters, digits, '.', '_' or '-',"
                + " starting with a letter or digit", e.getMessage());
    }
}
