package dev.dowser.rounds;

import dev.dowser.data.QueuedBelief;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.acquire.PoolScorer;
import dev.dowser.data.FeatureMatrix;
import dev.dowser.data.LabelledSet;
import dev.dowser.simulate.Simulation;
import dev.dowser.sampler.KernelChoice;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import dev.dowser.store.PredictionStore;
import dev.dowser.store.QueueEntry;
import dev.dowser.store.RoundStatus;
import dev.dowser.store.RoundStore;
import dev.dowser.store.SavedChain;
import java.io.IOException;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Optional;
import java.util.SplittableRandom;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Rounds on a pool: the cold start, a round from labels, and a failing round that leaves the queue alone. */
class RoundServiceTest {

    @TempDir
    Path dir;

    static SamplerConfig small() {
        return TestSupport.quickSampler();
    }

    /** Iris (Fisher 1936, as shipped by Debian's python3-sklearn), imported without its labels. */
    private Database irisWithoutLabels() throws IOException {
        Database db = database(dir.resolve("db"));
        TestSupport.importIrisWithoutLabels(db, dir);
        return db;
    }

    /**
     * Leases the served batch out, one person a place; stops at the first reserve place (the
     * next-best records served after the batch), which it gives back.
     */
    private static List<QueueEntry> drain(Database db, PoolRow pool) {
        List<QueueEntry> out = new ArrayList<>();
        for (int i = 0; i < 100; i++) {
            Optional<QueueEntry> e = db.leases().lease(pool.id(), "person-" + i, Duration.ofMinutes(10));
            if (e.isEmpty()) {
                break;
            }
            if (e.get().reserve()) {
                db.leases().release(pool.id(), e.get().round(), e.get().position(), "person-" + i);
                break;
            }
            out.add(e.get());
        }
        return out;
    }

    /** The database of the data folder {@code data}: an H2 file here, a PostgreSQL server in {@code RoundServiceOnPostgresqlTest}. */
    Database database(Path data) {
        return TestSupport.openDb(data);
    }

    @Test
    void coldStartThenARoundFromLabels() throws IOException {
        try (Database db = irisWithoutLabels(); PoolScorer scorer = new PoolScorer(2, 64)) {
            PoolRow pool = db.pools().require("iris");
            RoundService rounds = new RoundService(db, small(), scorer);
            RoundService.Outcome first = rounds.run("iris");
            assertTrue(first.published(), first.message());
            assertEquals(1, first.round());
            assertEquals("none", first.kernel());
            List<QueueEntry> queue = drain(db, pool);
            assertEquals(10, queue.size());
            assertEquals(1, queue.stream().filter(QueueEntry::spotCheck).count(), "a tenth are spot checks");
            // Each person labels the record they hold (class by the petal length, a stand-in labeller).
            for (QueueEntry e : queue) {
                db.labels().add(pool.id(), e.row(), e.row() < 50 ? "setosa" : e.row() < 100 ? "versicolor"
                        : "virginica", e.leasedTo(), null);
            }
            RoundService.Outcome second = rounds.run("iris");
            assertTrue(second.published(), second.message());
            assertEquals(2, second.round());
            assertEquals("mala", second.kernel());
            // The one record of the first queue sent to two people has one label: it comes first in the
            // new queue, for its second labeller, ahead of the round's ten new picks.
            QueueEntry pair = queue.stream().filter(e -> e.copies() == 2).findFirst().orElseThrow();
            List<QueueEntry> next = drain(db, pool);
            assertEquals(11, next.size());
            assertEquals(pair.row(), next.get(0).row());
            assertEquals(2, next.get(0).copies());
            for (QueueEntry e : next.subList(1, next.size())) {
                assertFalse(queue.stream().anyMatch(q -> q.row() == e.row()), "a labelled record was queued again");
                assertTrue(e.predictionJson() != null && e.predictionJson().contains("\"mean\"") && e.predictionJson().contains("\"sd\""));
            }
            // The model's view of each labelled record is kept for the review page: one row per labelled
            // record, probabilities summing to one.
            PredictionStore.Predictions kept = db.predictions().latest(pool.id()).orElseThrow();
            assertEquals(2, kept.round());
            assertEquals(queue.size(), kept.rows().length);
            for (QueueEntry e : queue) {
                assertEquals(1.0, Arrays.stream(kept.of(e.row())).sum(), 1e-5);
            }
            List<RoundStore.RoundRow> rows = db.rounds().list(pool.id());
            assertEquals(RoundStatus.PUBLISHED, rows.get(0).status());
            assertTrue(rows.get(0).healthJson().contains("rhatMax"));
        }
    }

    @Test
    void aFailingRoundLeavesThePreviousQueueInService() throws IOException {
        try (Database db = irisWithoutLabels(); PoolScorer scorer = new PoolScorer(2, 64)) {
            PoolRow pool = db.pools().require("iris");
            assertTrue(new RoundService(db, small(), scorer).run("iris").published());
            db.labels().add(pool.id(), 0, "setosa", "test", null);
            db.labels().add(pool.id(), 70, "versicolor", "test", null);
            // Plain SGLD with an absurd learning rate diverges at every step: the chain gives up.
            SamplerConfig broken = small().toBuilder().kernel(KernelChoice.SGLD).learningRate(1e30).build();
            RoundService.Outcome failed = new RoundService(db, broken, scorer).run("iris");
            assertFalse(failed.published());
            assertTrue(failed.message().contains("diverged"), failed.message());
            assertEquals(Optional.of(1), db.queues().servedRound(pool.id()), "the first round's queue stays served");
            RoundStore.RoundRow last = db.rounds().list(pool.id()).get(0);
            assertEquals(RoundStatus.FAILED, last.status());
            assertEquals(failed.message(), last.message());
            assertFalse(drain(db, pool).isEmpty(), "the old queue still hands out records");
        }
    }

    /** Iris's own labels (Fisher 1936): sklearn's file holds 50 setosa, then 50 versicolor, then 50 virginica. */
    private static int irisClass(long row) {
        return (int) (row / 50);
    }

    private static void labelAsIris(Database db, PoolRow pool, List<QueueEntry> queue) {
        for (QueueEntry e : queue) {
            // In the name of the person who holds it: a label by anyone else leaves the holder's place open.
            db.labels().add(pool.id(), e.row(), pool.classes().get(irisClass(e.row())), e.leasedTo(), null);
        }
    }

    /**
     * The server's rounds and the offline loop run the same step: from the same seed and the same
     * labels they queue the same records, round after round (a cold start, then chains continued).
     */
    @Test
    void theServerAndTheSimulationQueueTheSameRecords() throws IOException {
        try (Database db = irisWithoutLabels(); PoolScorer scorer = new PoolScorer(2, 64)) {
            PoolRow pool = db.pools().require("iris");
            SamplerConfig config = small();
            RoundService rounds = new RoundService(db, config, scorer);
            FeatureMatrix m = FeatureMatrix.load(db, "iris");
            int[] all = java.util.stream.IntStream.range(0, m.rows()).toArray();
            LabelledSet truth = LabelledSet.of(m, all, Arrays.stream(all).map(r -> irisClass(r)).toArray(),
                    pool.classes());
            PoolSettings settings = PoolSettings.parse(pool.settingsJson());
            Simulation.Labeller offline = new Simulation.Labeller(truth, settings, config,
                    RoundService.seedsOf(RoundService.DEFAULT_SEED, pool.id()));
            for (int round = 1; round <= 3; round++) {
                assertTrue(rounds.run("iris").published());
                // Records carried over for a second label were queued before: compare this round's picks.
                List<QueueEntry> served = drain(db, pool).stream()
                        .filter(e -> db.labels().resolution(pool.id(), e.row()).opinions().isEmpty()).toList();
                RoundStep.Result sim = offline.round(settings.batchSize(), scorer);
                assertEquals(sim.queue().stream().map(RoundStep.Pick::row).toList(),
                        served.stream().map(QueueEntry::row).toList(), "round " + round);
                assertEquals(sim.queue().stream().map(RoundStep.Pick::probability).toList(),
                        served.stream().map(QueueEntry::pickProbability).toList(), "round " + round);
                labelAsIris(db, pool, served);
                offline.reveal(sim);
            }
        }
    }

    /**
     * A round keeps what it was computed from: rebuilt from the database (its labels as they stood,
     * the chains it continued, its settings, sampler and seed), the queue comes out the same, even
     * after labels arrived and the settings changed.
     */
    @Test
    void aRoundsQueueIsRebuiltFromTheDatabase() throws IOException {
        try (Database db = irisWithoutLabels(); PoolScorer scorer = new PoolScorer(2, 64)) {
            PoolRow pool = db.pools().require("iris");
            RoundService rounds = new RoundService(db, small(), scorer);
            assertTrue(rounds.run("iris").published());
            labelAsIris(db, pool, drain(db, pool));
            assertTrue(rounds.run("iris").published());
            List<QueueEntry> second = drain(db, pool);
            labelAsIris(db, pool, second);
            assertTrue(rounds.run("iris").published());
            List<QueueEntry> third = drain(db, pool).stream()
                    .filter(e -> db.labels().resolution(pool.id(), e.row()).opinions().isEmpty()).toList();
            labelAsIris(db, pool, third.subList(0, 3));
            db.pools().updateSettings(pool.id(), PoolSettings.defaults().withStrategy(Strategy.RANDOM).toJson(), "test");
            RoundStep.Result rebuilt = new RoundService(db, small(), 99, scorer, RoundEvents.NONE).rebuild("iris", 3);
            assertEquals(third.stream().map(QueueEntry::row).toList(),
                    rebuilt.queue().stream().map(RoundStep.Pick::row).toList());
            assertEquals(third.stream().map(QueueEntry::predictionJson).toList(), rebuilt.queue().stream()
                    .map(p -> QueuedBelief.write(p.mean(), p.sd())).toList());
        }
    }

    /** Chains saved after a round are continued by the next, also after the database is closed and reopened. */
    @Test
    void aRestartContinuesWhereTheChainsStopped() throws IOException {
        Path data = dir.resolve("db");
        long stepsAfterFirst;
        SamplerConfig config = small().toBuilder().kernel(KernelChoice.PSGLD).build();
        try (Database db = irisWithoutLabels(); PoolScorer scorer = new PoolScorer(2, 64)) {
            PoolRow pool = db.pools().require("iris");
            RoundService rounds = new RoundService(db, config, scorer);
            rounds.run("iris");
            labelAsIris(db, pool, drain(db, pool));
            assertTrue(rounds.run("iris").published());
            List<SavedChain> saved = db.chains().load(pool.id());
            assertEquals(2, saved.size());
            assertEquals(2, saved.get(0).round(), "chains are saved under the round's own number");
            assertEquals(4 * saved.get(0).position().length, saved.get(0).kernelState().length,
                    "preconditioned SGLD keeps its preconditioner, a float per weight");
            stepsAfterFirst = saved.get(0).step();
        }
        try (Database db = database(data); PoolScorer scorer = new PoolScorer(2, 64)) {
            PoolRow pool = db.pools().require("iris");
            assertTrue(new RoundService(db, config, scorer).run("iris").published());
            List<SavedChain> saved = db.chains().load(pool.id());
            assertEquals(3, saved.get(0).round());
            assertEquals(stepsAfterFirst + config.steps().reburnInSteps() + (long) config.chains().perChain()
                    * config.steps().thinSteps(), saved.get(0).step(), "the third round continued the second's chains");
            assertEquals(stepsAfterFirst, db.chains().load(pool.id(), 2).get(0).step(), "the round before is kept");
        }
    }

    @Test
    void aDifferentNetworkStartsAfresh() throws IOException {
        try (Database db = irisWithoutLabels(); PoolScorer scorer = new PoolScorer(2, 64)) {
            PoolRow pool = db.pools().require("iris");
            new RoundService(db, small(), scorer).run("iris");
            labelAsIris(db, pool, drain(db, pool));
            new RoundService(db, small(), scorer).run("iris");
            long steps = db.chains().load(pool.id()).get(0).step();
            SamplerConfig wider = small().toBuilder().hidden(List.of(32)).build();
            assertTrue(new RoundService(db, wider, scorer).run("iris").published());
            assertEquals(wider.steps().burnInSteps() + (long) wider.chains().perChain() * wider.steps().thinSteps(),
                    db.chains().load(pool.id()).get(0).step(),
                    "chains of a 16-unit network cannot continue as a 32-unit one (they had " + steps + " steps)");
        }
    }

    /**
     * The share sent to two people is exact in size and uniform over the queue's places: a
     * chi-square test over the 10 places against 27.88, the 0.1% point for 9 df (Commons Math
     * gives the same quantile below).
     */
    @Test
    void theShareSentToTwoIsExactAndUniform() {
        assertEquals(27.877, new ChiSquaredDistribution(9)
                .inverseCumulativeProbability(0.999), 1e-3);
        SplittableRandom rng = new SplittableRandom(4);
        long[] hits = new long[10];
        int trials = 20_000;
        for (int t = 0; t < trials; t++) {
            boolean[] twice = RoundStep.chooseTwice(10, 0.2, rng);
            int n = 0;
            for (int i = 0; i < 10; i++) {
                if (twice[i]) {
                    hits[i]++;
                    n++;
                }
            }
            assertEquals(2, n);
        }
        double expected = trials * 2 / 10.0;
        double chi2 = 0;
        for (long h : hits) {
            chi2 += (h - expected) * (h - expected) / expected;
        }
        assertTrue(chi2 < 27.88, "chi-square " + chi2);
        for (boolean b : RoundStep.chooseTwice(10, 0, rng)) {
            assertFalse(b);
        }
    }
}
