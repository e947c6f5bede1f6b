package dev.dowser.rounds;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.dowser.TestSupport;
import dev.dowser.stats.Wilson;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import dev.dowser.store.QueueEntry;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.IntStream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Accuracy counts spot checks only, in the order labels were given, against the belief held when
 * the record was queued. The interval is Wilson's, itself checked against Newcombe (1998) in
 * WilsonTest; here the check is the bookkeeping: 15 right of 148 gives Newcombe's 0.0624-0.1605.
 */
class SpotCheckAccuracyTest {

    @TempDir
    Path dir;

    @Test
    void countsOnlySpotChecksInLabelOrder() {
        TestSupport.MutableClock clock = new TestSupport.MutableClock();
        try (Database db = Database.open(dir, clock)) {
            StringBuilder csv = new StringBuilder("x\n");
            IntStream.range(0, 400).forEach(i -> csv.append(i).append('\n'));
            TestSupport.importText(db, "p", csv.toString(), TestSupport.csv("p").withClasses(List.of("a", "b")));
            PoolRow pool = db.pools().require("p");
            // Rows 0..147 are spot checks believed "a" (0.8); row 200 is a picked record, not a check.
            List<QueueEntry> queue = new ArrayList<>();
            for (int r = 0; r < 148; r++) {
                queue.add(new QueueEntry(1, r, r, 0, true, "{\"mean\":[0.8,0.2],\"sd\":[0.1,0.1]}", null, null));
            }
            queue.add(new QueueEntry(1, 148, 200, 0.5, false, "{\"mean\":[0.9,0.1]}", null, null));
            db.queues().publish(pool.id(), 1, queue);
            db.labels().add(pool.id(), 200, "a", "ana", null);
            for (int r = 0; r < 148; r++) {
                clock.advance(Duration.ofSeconds(1));
                db.labels().add(pool.id(), r, r < 15 ? "a" : "b", "ana", null);
            }
            SpotCheckAccuracy.Report report = SpotCheckAccuracy.of(db, pool);
            assertEquals(148, report.points().size());
            SpotCheckAccuracy.Point first = report.points().get(0);
            assertEquals(2, first.labels(), "the picked record's label counts toward labels, not checks");
            assertEquals(1, first.checked());
            assertEquals(1, first.correct());
            SpotCheckAccuracy.Point last = report.last();
            assertEquals(149, last.labels());
            assertEquals(15, last.correct());
            // Newcombe (1998), Table I, method 3: 15/148 gives 0.0624 to 0.1605.
            assertEquals(0.0624, last.lower(), 5e-5);
            assertEquals(0.1605, last.upper(), 5e-5);
            Wilson w = Wilson.of95(15, 148);
            assertEquals(w.lower(), last.lower(), 1e-15);
            // All believed "a" at 0.8: confidence 0.8 against accuracy 15/148 in one bin.
            assertEquals(Math.abs(0.8 - 15.0 / 148), report.ece(), 1e-6);
        }
    }
}
