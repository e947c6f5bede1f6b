package dev.dowser.store;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import java.nio.file.Path;
import java.time.Clock;
import java.time.Duration;
import java.util.List;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * What a round writes and the next one reads: its row (inputs, end, what it told), its chains'
 * states (with and without a kernel state, and only the latest two rounds kept), and its
 * predictions, each replaced by the next round's. Values go in and must come back exactly.
 */
class RoundStateStoreTest {

    @TempDir
    Path dir;
    final TestSupport.MutableClock clock = new TestSupport.MutableClock();
    Database db;
    long pool;

    @BeforeEach
    void open() {
        db = database(clock);
        TestSupport.importText(db, "p", "x\n1\n2\n3\n", TestSupport.csv("p").withClasses(List.of("a", "b")));
        pool = db.pools().require("p").id();
    }

    @AfterEach
    void close() {
        db.close();
    }

    /** The database the tests run on: an H2 file here, a PostgreSQL server in {@code RoundStateOnPostgresqlTest}. */
    Database database(Clock clock) {
        return Database.open(dir, clock);
    }

    private static List<SavedChain> chains(int round) {
        // Chain 0 has no kernel state (plain SGLD); chain 1 has one and a hierarchical prior's precisions.
        return List.of(new SavedChain(0, round, "sgld", "{\"layers\":[4,8,2]}", new float[] {0.5f, -1.25f, Float.MIN_VALUE},
                        null, null, 1e-3, 100L * round),
                new SavedChain(1, round, "psgld", "{\"layers\":[4,8,2]}", new float[] {3f, -0f, 1e-30f},
                        new byte[] {0, 1, -1, 127, -128}, new double[] {1.5, 2.5}, 2e-3, 100L * round + 1));
    }

    @Test
    void chainStatesComeBackExactlyAndOnlyTheLatestTwoRoundsAreKept() {
        db.chains().save(pool, chains(1));
        List<SavedChain> back = db.chains().load(pool);
        assertEquals(2, back.size());
        assertNull(back.get(0).kernelState(), "a chain saved without a kernel state");
        assertNull(back.get(0).hyper());
        assertArrayEquals(new float[] {0.5f, -1.25f, Float.MIN_VALUE}, back.get(0).position());
        assertArrayEquals(new byte[] {0, 1, -1, 127, -128}, back.get(1).kernelState());
        assertArrayEquals(new double[] {1.5, 2.5}, back.get(1).hyper());
        assertEquals(2e-3, back.get(1).stepSize());
        assertEquals(101L, back.get(1).step());
        assertEquals("psgld", back.get(1).kernel());

        db.chains().save(pool, chains(2));
        db.chains().save(pool, chains(3));
        db.chains().save(pool, chains(3)); // saved again: replaced, not doubled
        assertTrue(db.chains().load(pool, 1).isEmpty(), "round 1's chains are older than the latest two rounds");
        assertEquals(2, db.chains().load(pool, 2).size());
        assertEquals(3, db.chains().load(pool).get(0).round());
        assertEquals(2, db.chains().load(pool).size());
    }

    @Test
    void aRoundsRowKeepsItsInputsItsEndAndWhatItTold() {
        assertEquals(1, db.rounds().next(pool));
        db.rounds().start(pool, 1, 0, new RoundStore.Inputs(-7L, "{\"chains\":4}", "{\"batch_size\":10}", 0, null));
        RoundStore.Inputs in = db.rounds().inputs(pool, 1).orElseThrow();
        assertNull(in.chainsFrom(), "a round whose chains started afresh");
        assertEquals(-7L, in.seed());
        clock.advance(Duration.ofSeconds(3));
        db.rounds().finish(pool, 1, "sgld", null, "{\"r_hat\":1.01}");
        db.rounds().settled(pool, 1, new RoundStore.Settled(3, Double.NaN, 0, 0.25, 0.125));

        db.rounds().start(pool, 2, 2, new RoundStore.Inputs(8L, "{}", "{}", 5, 1));
        assertEquals(1, db.rounds().inputs(pool, 2).orElseThrow().chainsFrom());
        assertEquals(1, db.rounds().interruptRunning(), "round 2 was running");

        List<RoundStore.RoundRow> rows = db.rounds().list(pool);
        RoundStore.RoundRow first = rows.stream().filter(r -> r.round() == 1).findFirst().orElseThrow();
        assertEquals(RoundStatus.PUBLISHED, first.status());
        assertEquals(Duration.ofSeconds(3), Duration.between(first.startedAt(), first.finishedAt()));
        assertEquals("{\"r_hat\":1.01}", first.healthJson());
        RoundStore.RoundRow second = rows.stream().filter(r -> r.round() == 2).findFirst().orElseThrow();
        assertEquals(RoundStatus.INTERRUPTED, second.status());
        assertEquals(RoundStore.INTERRUPTED_WHY, second.message());
        RoundStore.Evidence told = db.rounds().evidence(pool).get(0);
        assertTrue(Double.isNaN(told.settled().agreement()), "nothing to compare is kept as NaN");
        assertEquals(0.125, told.settled().informationTop());
        assertEquals(3, db.rounds().next(pool));
    }

    @Test
    void eachRoundsPredictionsReplaceTheLast() {
        db.predictions().replace(pool, new PredictionStore.Predictions(1, new long[] {0, 2},
                new float[] {0.25f, 0.75f, 0.5f, 0.5f}, 2));
        db.predictions().replace(pool, new PredictionStore.Predictions(2, new long[] {1},
                new float[] {0.125f, 0.875f}, 2));
        PredictionStore.Predictions p = db.predictions().latest(pool).orElseThrow();
        assertEquals(2, p.round());
        assertArrayEquals(new long[] {1}, p.rows());
        assertArrayEquals(new float[] {0.125f, 0.875f}, p.probabilities());

        long[] stopSet = {0, 1, 2};
        db.predictions().replaceStopSet(pool, new PredictionStore.StopSetClasses(1, stopSet, new int[] {0, 1, 1}));
        db.predictions().replaceStopSet(pool, new PredictionStore.StopSetClasses(2, stopSet, new int[] {1, 1, 0}));
        PredictionStore.StopSetClasses s = db.predictions().latestStopSet(pool).orElseThrow();
        assertNotNull(s);
        assertEquals(2, s.round());
        assertArrayEquals(new int[] {1, 1, 0}, s.classes());
    }
}
