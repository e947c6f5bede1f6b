package dev.dowser.rounds;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.acquire.PoolScorer;
import dev.dowser.advice.AccuracyReport;
import dev.dowser.advice.ChainAdvice;
import dev.dowser.advice.StopAdvice;
import dev.dowser.data.QueuedBelief;
import dev.dowser.stats.Lure;
import dev.dowser.stats.Wilson;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import dev.dowser.store.QueueEntry;
import dev.dowser.store.QueueStore;
import dev.dowser.store.RoundStore;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * What the server keeps for honest accuracy and when to stop, and what it reads back: each pick's
 * place and probability, the rounds' stop-set agreement, and the report built from them. On iris
 * (Fisher 1936, as shipped by Debian's python3-sklearn) with power sampling and a labeller who
 * gives the true class.
 */
class AdviceServiceTest {

    @TempDir
    Path dir;

    private Database iris() {
        Database db = TestSupport.openDb(dir.resolve("db"));
        TestSupport.importIrisWithoutLabels(db, dir);
        return db;
    }

    /** Iris is in class order, 50 each: the row gives the true class. */
    private static String truth(long row) {
        return row < 50 ? "setosa" : row < 100 ? "versicolor" : "virginica";
    }

    private static void labelServedQueue(Database db, PoolRow pool) {
        for (int i = 0; i < 200; i++) {
            Optional<QueueEntry> e = db.leases().lease(pool.id(), "person-" + (i % 2), Duration.ofMinutes(10));
            if (e.isEmpty()) {
                return;
            }
            if (e.get().reserve()) {
                // The batch is labelled; the next-best records after it are not this round's picks.
                db.leases().release(pool.id(), e.get().round(), e.get().position(), "person-" + (i % 2));
                return;
            }
            db.labels().add(pool.id(), e.get().row(), truth(e.get().row()), "person-" + (i % 2), null);
        }
    }

    @Test
    void roundsKeepWhatTheEstimatesNeedAndTheReportReadsIt() {
        try (Database db = iris(); PoolScorer scorer = new PoolScorer(2, 64)) {
            PoolRow pool = db.pools().require("iris");
            db.pools().updateSettings(pool.id(), PoolSettings.defaults().withStrategy(Strategy.POWER).toJson(), "test");
            RoundService rounds = new RoundService(db, TestSupport.quickSampler(), scorer);
            AdviceService advice = new AdviceService(db);
            assertEquals(StopAdvice.State.START, advice.report("iris").accuracy().advice().state());
            for (int r = 0; r < 5; r++) {
                assertTrue(rounds.run("iris").published());
                labelServedQueue(db, pool);
            }
            // Each round's own picks know their place 1..10 and their probability; the first round's
            // (the cold start) were certain, later ones were drawn by power sampling or uniformly.
            List<QueueStore.Picked> picks = db.queues().picks(pool.id());
            assertEquals(50, picks.size());
            for (int round = 1; round <= 5; round++) {
                int k = round;
                List<QueueStore.Picked> mine = picks.stream().filter(p -> p.round() == k).toList();
                for (int m = 0; m < mine.size(); m++) {
                    assertEquals(m + 1, mine.get(m).order());
                }
                if (round > 1) {
                    assertTrue(mine.stream().allMatch(p -> p.probability() < 1 && p.predictionJson() != null));
                    // Spot checks come last among the picks, each uniform over the candidates still free.
                    QueueStore.Picked spot = mine.get(9);
                    assertTrue(spot.spotCheck());
                }
            }
            // Rounds 2-5 had a model: candidates, information and, from round 3, stop-set agreement.
            List<RoundStore.Evidence> evidence = db.rounds().evidence(pool.id());
            assertEquals(List.of(2, 3, 4, 5), evidence.stream().map(RoundStore.Evidence::round).toList());
            assertEquals(140, evidence.get(0).settled().candidates());
            assertTrue(Double.isNaN(evidence.get(0).settled().agreement()));
            for (RoundStore.Evidence e : evidence.subList(1, 4)) {
                assertTrue(e.settled().agreement() > 0 && e.settled().agreement() <= 1, "kappa " + e.settled());
                assertEquals(150 - e.labelsAtStart(), e.settled().compared(), "the stop set is all of iris,"
                        + " compared where unlabelled");
                assertTrue(e.settled().informationTop() > 0 && e.settled().informationTop() <= e.settled().information());
            }
            AdviceService.Report report = advice.report("iris");
            AccuracyReport a = report.accuracy();
            assertEquals(5, a.modelRound(), "the newest round whose picks have labels");
            assertTrue(a.picked().known());
            assertEquals(List.of(2, 3, 4, 5), a.perRound().stream().map(AccuracyReport.RoundEstimate::round).toList());
            assertEquals(3, a.agreements().size());
            // The report's LURE over round 5 alone matches the weights computed by hand from the store.
            List<QueueStore.Picked> last = picks.stream().filter(p -> p.round() == 5).toList();
            double[] q = last.stream().mapToDouble(QueueStore.Picked::probability).toArray();
            double[] v = Lure.weights(q, evidence.get(3).settled().candidates());
            double risk = 0;
            for (int m = 0; m < last.size(); m++) {
                double[] mean = QueuedBelief.parse(last.get(m).predictionJson()).mean();
                int predicted = mean[0] >= mean[1] && mean[0] >= mean[2] ? 0 : mean[1] >= mean[2] ? 1 : 2;
                int given = List.of("setosa", "versicolor", "virginica").indexOf(truth(last.get(m).row()));
                risk += v[m] * (predicted == given ? 0 : 1) / last.size();
            }
            AccuracyReport.RoundEstimate fifth = a.perRound().get(a.perRound().size() - 1);
            assertEquals(5, fifth.round());
            assertEquals(Math.max(0, Math.min(1, 1 - risk)), fifth.accuracy().accuracy(), 1e-9);
            assertNull(a.curve(), "4 rounds are too few for a learning curve");
            assertEquals(StopAdvice.State.EARLY, a.advice().state());
        }
    }

    @Test
    void spotChecksCountInTheWindowAgainstTheBeliefAtQueueTime() {
        // A hand-made round: 148 spot checks believed "setosa" (0.8), 15 of them labelled setosa,
        // and one pick by score. 15 of 148 gives Newcombe's (1998, Table I) 0.0624 to 0.1605.
        try (Database db = iris()) {
            PoolRow pool = db.pools().require("iris");
            db.rounds().start(pool.id(), 1, 0, new RoundStore.Inputs(1, null, null, 0, null));
            db.rounds().finish(pool.id(), 1, "mala", "test", "{}");
            db.rounds().settled(pool.id(), 1, new RoundStore.Settled(150, Double.NaN, 0, 1, 1));
            List<QueueEntry> queue = new ArrayList<>();
            queue.add(new QueueEntry(1, 0, 149, 0.5, false, "{\"mean\":[0.9,0.05,0.05]}", null, null, 1, 1.0, 1));
            for (int r = 0; r < 148; r++) {
                queue.add(new QueueEntry(1, r + 1, r, 0, true, "{\"mean\":[0.8,0.1,0.1],\"sd\":[0,0,0]}", null, null,
                        1, 1.0 / (149 - r), r + 2));
            }
            db.queues().publish(pool.id(), 1, queue);
            for (int r = 0; r < 148; r++) {
                db.labels().add(pool.id(), r, r < 15 ? "setosa" : "virginica", "ana", null);
            }
            AdviceService.Report report = new AdviceService(db).report("iris");
            AccuracyReport a = report.accuracy();
            assertEquals(148, a.checked().labels());
            assertEquals(0.0624, a.checked().lower(), 5e-5);
            assertEquals(0.1605, a.checked().upper(), 5e-5);
            // That interval is +-4.9 points already (Wilson needs 143 checks at 0.10): no more are asked for.
            assertEquals(143, Wilson.trialsFor(15.0 / 148, 0.05, Wilson.Z95));
            assertEquals(0, a.checked().moreChecksFor(0.05));
            // The pick by score has no label: the round's weighted estimate stops before it.
            assertFalse(a.picked().known());
            // Every check believed "setosa" at 0.8: confidence 0.8 against accuracy 15/148 in one bin.
            assertEquals(Math.abs(0.8 - 15.0 / 148), report.ece(), 1e-6);
        }
    }

    @Test
    void chainAdviceJudgesARoundByTheDrawsItKept() {
        PoolSettings.Sampling now = new PoolSettings.Sampling(4, 64, 300);
        String health = "{\"rhatMax\":1.6,\"essBulkMin\":4,\"essTailMin\":5}";
        ChainAdvice a = AdviceService.chains(health, "{\"chains\":4,\"draws\":64}", now);
        assertEquals(ChainAdvice.Level.ACT, a.level());
        assertEquals(Map.of("draws", 128), Map.of(a.points().get(0).setting(), a.points().get(0).suggest()));
        // After an admin raised the draws, the same round's advice says so instead of asking again.
        ChainAdvice raised = AdviceService.chains(health, "{\"chains\":4,\"draws\":64}", new PoolSettings.Sampling(4, 128,
                300));
        assertTrue(raised.points().get(0).text().contains("the next round uses them"), raised.toString());
        assertEquals(ChainAdvice.Level.NOTE, raised.level());
        assertEquals("Predictions rested on few independent draws; the settings have been raised since.",
                raised.summary());
    }
}
