package dev.dowser.rounds;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.acquire.PoolScorer;
import dev.dowser.data.ImportProgress;
import dev.dowser.data.Importer;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import dev.dowser.store.QueueEntry;
import dev.dowser.store.RoundStatus;
import dev.dowser.store.RoundStore;
import dev.dowser.store.SavedChain;
import java.io.IOException;
import java.io.InputStream;
import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Set;
import java.util.stream.Collectors;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The worker starts a round on request and after every batch of new labels, and only then. */
class RoundWorkerTest {

    @TempDir
    Path dir;

    private static void await(TestSupport.Condition done, String what) {
        TestSupport.await(Duration.ofSeconds(60), done, what);
    }

    @Test
    void roundsFollowRequestsAndBatchesOfLabels() throws IOException, InterruptedException {
        // Iris (Fisher 1936, as shipped by Debian's python3-sklearn), imported without its labels.
        try (Database db = TestSupport.openDb(dir.resolve("db")); PoolScorer scorer = new PoolScorer(2, 64)) {
            TestSupport.importIrisWithoutLabels(db, dir);
            PoolRow pool = db.pools().require("iris");
            try (RoundWorker worker = new RoundWorker(new RoundService(db, RoundServiceTest.small(), scorer), "iris", 5)) {
                worker.request();
                await(() -> worker.roundsRun() == 1, "the requested round");
                assertTrue(worker.lastOutcome().published());
                for (int i = 0; i < 4; i++) {
                    QueueEntry e = db.leases().lease(pool.id(), "ana", Duration.ofMinutes(10)).orElseThrow();
                    db.labels().add(pool.id(), e.row(), "setosa", "ana", null);
                    worker.labelAdded();
                }
                Thread.sleep(200);
                assertEquals(1, worker.roundsRun(), "four labels of a batch of five must not start a round");
                assertEquals(1, worker.labelsToNextRound());
                QueueEntry e = db.leases().lease(pool.id(), "ana", Duration.ofMinutes(10)).orElseThrow();
                db.labels().add(pool.id(), e.row(), "versicolor", "ana", null);
                worker.labelAdded();
                await(() -> worker.roundsRun() == 2, "the round after five labels");
                assertTrue(worker.lastOutcome().published(), worker.lastOutcome().message());
                assertEquals(2, db.queues().servedRound(pool.id()).orElseThrow());
            }
        }
    }

    @Test
    void aLookAtTheStoreTakenWhileARoundRanStartsNoRoundAfterIt() throws IOException, InterruptedException {
        // Iris (Fisher 1936, as shipped by Debian's python3-sklearn), imported without its labels.
        try (Database db = TestSupport.openDb(dir.resolve("db")); PoolScorer scorer = new PoolScorer(2, 64)) {
            TestSupport.importIrisWithoutLabels(db, dir);
            PoolRow pool = db.pools().require("iris");
            try (RoundWorker worker = new RoundWorker(new RoundService(db, RoundServiceTest.small(), scorer), "iris", 5)) {
                // The watcher's order: note the worker, read the store (nothing served), ask. Here the
                // first round runs and serves a full batch between the look and the asking.
                int seen = worker.quietAfter();
                assertEquals(0, seen);
                assertTrue(db.queues().servedRound(pool.id()).isEmpty());
                worker.request();
                assertEquals(-1, worker.quietAfter(), "a worker with a round waiting or running is not quiet");
                await(() -> worker.roundsRun() == 1, "the first round");
                worker.requestIfStillQuiet(seen);
                Thread.sleep(200);
                assertEquals(1, worker.roundsRun(), "a look taken before the round ended must not start another");
                assertEquals(1, db.rounds().list(pool.id()).size());
                // A look taken now still holds: it asks for the round.
                worker.requestIfStillQuiet(worker.quietAfter());
                await(() -> worker.roundsRun() == 2, "the round asked for by a look that still holds");
            }
        }
    }

    @Test
    void aDeskCountTakenBeforeARoundPublishedStartsNoRoundAfterIt() throws IOException, InterruptedException {
        // Iris (Fisher 1936, as shipped by Debian's python3-sklearn), imported without its labels.
        try (Database db = TestSupport.openDb(dir.resolve("db")); PoolScorer scorer = new PoolScorer(2, 64)) {
            TestSupport.importIrisWithoutLabels(db, dir);
            PoolRow pool = db.pools().require("iris");
            try (RoundWorker worker = new RoundWorker(new RoundService(db, RoundServiceTest.small(), scorer), "iris", 50)) {
                worker.request();
                await(() -> worker.roundsRun() == 1, "the first round");
                // The desk's order: note the worker, count the open places (low: the batch is taken),
                // then report. Here a round publishes a full batch between the count and the report.
                int quiet = worker.quietAfter();
                int openInBatch = 0;
                worker.request();
                await(() -> worker.roundsRun() == 2, "the round that publishes in between");
                int openNow = db.queues().openInBatch(pool.id());
                assertTrue(openNow > RoundWorker.LOW_WATER_PER_LABELLER, "the new batch is open: " + openNow);
                worker.deskActive("ana", quiet, openInBatch);
                Thread.sleep(200);
                assertEquals(2, worker.roundsRun(), "a count taken before the round published must not start another");
                assertTrue(!worker.busy(), "no round waits or runs");
                assertEquals(2, db.rounds().list(pool.id()).size());
                // A count that still holds at the low-water mark asks for the round.
                int quietNow = worker.quietAfter();
                worker.deskActive("ana", quietNow, 0);
                await(() -> worker.roundsRun() == 3, "the round asked for by a count that still holds");
            }
        }
    }

    @Test
    void closingStopsARunningRoundAtASafePointAndSavesItsChains() throws IOException, InterruptedException {
        // Iris (Fisher 1936, as shipped by Debian's python3-sklearn), with its labels.
        TestSupport.OpenDataset iris = TestSupport.openDataset("iris", dir);
        try (Database db = TestSupport.openDb(dir.resolve("db")); PoolScorer scorer = new PoolScorer(2, 64)) {
            try (InputStream in = Files.newInputStream(iris.csv())) {
                new Importer(db).run(in, "iris.csv", TestSupport.csv("iris").withLabel("label"), ImportProgress.NONE);
            }
            PoolRow pool = db.pools().require("iris");
            // Far more steps than the test waits for: only the stop can end this round in time.
            SamplerConfig endless = RoundServiceTest.small().toBuilder().burnInSteps(50_000_000).build();
            Set<Thread> before = chainThreads();
            RoundWorker worker = new RoundWorker(new RoundService(db, endless, scorer), "iris", 5);
            worker.request();
            await(() -> !db.rounds().list(pool.id()).isEmpty(), "the round to start");
            // Close once every chain of this round has run for a while (a step on iris takes microseconds):
            // a fixed 300 ms sleep was outlasted on a loaded machine, and a chain saved at step 0.
            await(() -> chainThreadsBusy(before, endless.chains().count()), "every chain to take steps");
            long begun = System.nanoTime();
            worker.close();
            double seconds = (System.nanoTime() - begun) / 1e9;
            assertTrue(seconds < 10, "closing took " + seconds + " s");
            RoundStore.RoundRow round = db.rounds().list(pool.id()).get(0);
            assertEquals(RoundStatus.STOPPED, round.status(), round.message());
            assertTrue(round.message().contains("safe point"), round.message());
            assertTrue(db.queues().servedRound(pool.id()).isEmpty(), "a stopped round must not publish");
            List<SavedChain> saved = db.chains().load(pool.id());
            assertEquals(endless.chains().count(), saved.size(), "every chain's state is saved");
            for (SavedChain c : saved) {
                assertTrue(c.step() > 0, "chain " + c.chain() + " saved before any step");
            }
        }
    }

    /** The sampler's chain threads alive now (ChainSet names them dowser-chain). */
    private static Set<Thread> chainThreads() {
        return Thread.getAllStackTraces().keySet().stream()
                .filter(t -> t.isAlive() && t.getName().equals("dowser-chain")).collect(Collectors.toSet());
    }

    /** Whether {@code chains} chain threads started since {@code before} have each used 50 ms of CPU. */
    private static boolean chainThreadsBusy(Set<Thread> before, int chains) {
        ThreadMXBean mx = ManagementFactory.getThreadMXBean();
        return chainThreads().stream().filter(t -> !before.contains(t))
                .filter(t -> mx.getThreadCpuTime(t.getId()) > 50_000_000L).count() >= chains;
    }
}
