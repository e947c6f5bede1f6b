package dev.dowser.store;

import dev.dowser.TestSupport;
import dev.dowser.labels.LabelRow;
import dev.dowser.labels.Resolution;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.stream.IntStream;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Queues and leases: one person per record at a time, leases that run out, labelled records skipped. */
class QueueStoreTest {

    static final Duration LEASE = Duration.ofMinutes(10);

    @TempDir
    Path dir;
    TestSupport.MutableClock clock;
    Database db;
    long pool;

    @BeforeEach
    void open() {
        clock = new TestSupport.MutableClock();
        db = Database.open(dir, clock);
        StringBuilder csv = new StringBuilder("x\n");
        IntStream.range(0, 40).forEach(i -> csv.append(i).append('\n'));
        TestSupport.importText(db, "p", csv.toString(), TestSupport.csv("p").withClasses(List.of("a", "b")));
        pool = db.pools().require("p").id();
    }

    @AfterEach
    void close() {
        db.close();
    }

    private void publish(int round, int size) {
        List<QueueEntry> entries = new ArrayList<>();
        for (int i = 0; i < size; i++) {
            entries.add(new QueueEntry(round, i, i, 1.0 / (i + 1), i % 10 == 0, null, null, null));
        }
        db.queues().publish(pool, round, entries);
    }

    @Test
    void noRecordGoesToTwoPeopleAtOnce() throws Exception {
        publish(1, 30);
        Set<Long> handed = ConcurrentHashMap.newKeySet();
        List<Long> all = java.util.Collections.synchronizedList(new ArrayList<>());
        ExecutorService pool20 = Executors.newFixedThreadPool(20);
        List<Future<?>> fs = new ArrayList<>();
        for (int p = 0; p < 20; p++) {
            String person = "labeller-" + p;
            fs.add(pool20.submit(() -> {
                // Each person keeps asking; a person already holding a lease gets the same record back,
                // so to take a second one they must act as someone new: ask under a fresh name.
                for (int k = 0; k < 5; k++) {
                    Optional<QueueEntry> e = db.queues().lease(pool, person + "/" + k, LEASE);
                    e.ifPresent(q -> {
                        all.add(q.row());
                        handed.add(q.row());
                    });
                }
            }));
        }
        for (Future<?> f : fs) {
            f.get();
        }
        pool20.shutdown();
        assertEquals(30, all.size(), "every record handed out exactly once");
        assertEquals(30, handed.size(), "a record was handed to two people: " + all);
    }

    @Test
    void aLeaseThatRunsOutReturnsTheRecord() {
        publish(1, 3);
        QueueEntry first = db.queues().lease(pool, "ana", LEASE).orElseThrow();
        assertEquals(0, first.row());
        assertEquals(1, db.queues().lease(pool, "ben", LEASE).orElseThrow().row());
        clock.advance(LEASE.plusSeconds(1));
        assertEquals(0, db.queues().lease(pool, "cleo", LEASE).orElseThrow().row(), "ana's lease ran out");
    }

    @Test
    void aHolderGetsTheirRecordBackAndARecordLabelledMeanwhileIsSkipped() {
        publish(1, 3);
        QueueEntry held = db.queues().lease(pool, "ana", LEASE).orElseThrow();
        assertEquals(held.row(), db.queues().lease(pool, "ana", LEASE).orElseThrow().row());
        db.labels().add(pool, 1, "a", "ben", null);
        db.labels().add(pool, 0, "b", "ana", null);
        // Row 0 is labelled (ana finished it), row 1 was labelled elsewhere: the next is row 2.
        assertEquals(2, db.queues().lease(pool, "ana", LEASE).orElseThrow().row());
        assertTrue(db.queues().lease(pool, "dan", LEASE).isEmpty(), "nothing left to hand out");
    }

    @Test
    void aNewQueueReplacesTheOldAtOnceAndReleaseFreesARecord() {
        publish(1, 2);
        QueueEntry a = db.queues().lease(pool, "ana", LEASE).orElseThrow();
        db.queues().release(pool, a.round(), a.position(), "ana");
        assertEquals(a.row(), db.queues().lease(pool, "ben", LEASE).orElseThrow().row(), "a released record is free");
        List<QueueEntry> next = List.of(new QueueEntry(2, 0, 17, 0.9, false, null, null, null));
        db.queues().publish(pool, 2, next);
        assertEquals(Optional.of(2), db.queues().servedRound(pool));
        assertEquals(17, db.queues().lease(pool, "cleo", LEASE).orElseThrow().row());
    }

    @Test
    void aRecordSentToTwoGoesToTwoDifferentPeopleOneAtATime() {
        db.queues().publish(pool, 1, List.of(new QueueEntry(1, 0, 5, 0.9, false, null, null, null).withCopies(2),
                new QueueEntry(1, 1, 6, 0.8, false, null, null, null)));
        QueueEntry first = db.queues().lease(pool, "ana", LEASE).orElseThrow();
        assertEquals(5, first.row());
        assertEquals(2, first.copies());
        assertEquals(6, db.queues().lease(pool, "ben", LEASE).orElseThrow().row(), "held by ana meanwhile");
        db.labels().add(pool, 5, "a", "ana", null);
        assertEquals(Optional.empty(), db.queues().lease(pool, "ana", LEASE).filter(e -> e.row() == 5),
                "never twice to the same person");
        assertEquals(5, db.queues().lease(pool, "cy", LEASE).orElseThrow().row(), "free for a second person");
        db.labels().add(pool, 5, "b", "cy", null);
        assertTrue(db.queues().served(pool).get(0).labelled(), "two people labelled it: done");
        assertEquals(Optional.empty(), db.queues().lease(pool, "dee", LEASE).filter(e -> e.row() == 5));
        Resolution r = db.labels().resolution(pool, 5);
        assertEquals(Resolution.UNRESOLVED, r.status());
        assertEquals(List.of("ana", "cy"), r.opinions().stream().map(Resolution.Opinion::person).toList());
    }
}
