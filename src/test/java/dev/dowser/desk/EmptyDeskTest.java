package dev.dowser.desk;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import dev.dowser.TestSupport;
import dev.dowser.rounds.RoundWorker;
import dev.dowser.rounds.RoundWorkers;
import dev.dowser.sampler.KernelChoice;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.store.Database;
import dev.dowser.store.RoundStatus;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A pool with nothing served says so plainly to each role, with the way out (issue 14 item 2):
 * while its first batch is being picked, everyone is told it appears by itself; when the round
 * that would have served it failed, a labeller is told to ask a reviewer or an admin, and they
 * are told where to start one. The round fails for real: plain SGLD with an absurd learning rate
 * diverges (the first round samples, because the pool comes with labels).
 */
class EmptyDeskTest {

    @TempDir
    Path dir;
    Database db;
    RoundWorkers rounds;

    @AfterEach
    void close() {
        if (rounds != null) {
            rounds.close();
        }
        db.close();
    }

    @Test
    void aPoolWithNothingServedSaysWhyAndTheWayOutToEachRole() {
        db = TestSupport.openDb(dir.resolve("db"));
        StringBuilder csv = new StringBuilder("id,x,y,label\n");
        for (int i = 0; i < 40; i++) {
            csv.append('r').append(i).append(',').append(i * 0.25).append(',').append(i % 7).append(',')
                    .append(i < 6 ? (i % 2 == 0 ? "a" : "b") : "").append('\n');
        }
        TestSupport.importText(db, "p", csv.toString(), TestSupport.csv("p").withId("id").withLabel("label"));
        SamplerConfig diverging = TestSupport.quickSampler().toBuilder().kernel(KernelChoice.SGLD).learningRate(1e30)
                .build();
        rounds = new RoundWorkers(db, diverging);
        Desk desk = new Desk(db, rounds, LabelEvents.NONE);

        // The first person at the desk of a pool with nothing served starts its first round.
        Offer first = desk.next("p", "ana", false);
        assertNull(first.record());
        assertEquals("the first batch of this pool is being picked; it appears here by itself in a moment",
                first.message());

        RoundWorker worker = rounds.worker("p");
        TestSupport.await(Duration.ofSeconds(60), () -> !worker.busy() && worker.lastOutcome() != null,
                "the first round to end");
        assertEquals(RoundStatus.FAILED, worker.lastOutcome().status(), worker.lastOutcome().message());
        String why = "no batch is served yet: the last round failed (" + worker.lastOutcome().message() + ")";

        Offer labeller = desk.next("p", "ana", false);
        assertNull(labeller.record());
        assertEquals(why + "; ask a reviewer or an admin to start one from the pool's overview", labeller.message());
        Offer reviewer = desk.next("p", "rae", true);
        assertNull(reviewer.record());
        assertEquals(why + "; once the cause is fixed, press Start a round now on the pool's overview",
                reviewer.message());
        // Asking again does not start a failing round over and over; the pool's rounds say what happened.
        assertEquals(List.of(RoundStatus.FAILED), db.rounds().list(db.pools().require("p").id()).stream()
                .map(r -> r.status()).toList());
    }
}
