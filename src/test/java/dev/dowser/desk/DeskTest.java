package dev.dowser.desk;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import dev.dowser.TestSupport;
import dev.dowser.rounds.RoundWorkers;
import dev.dowser.sampler.KernelChoice;
import dev.dowser.store.RoundStatus;
import java.time.Duration;
import java.util.List;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;

/**
 * A desk with nothing served says so plainly, with the way out for the person's role (issue 14,
 * blocker 2): while the first batch is being picked, and when the last round failed.
 */
class DeskTest extends PoolFixture {

    Desk desk;

    @Override
    String records() {
        return "r1,0.5\nr2,1.5\nr3,2.5\n";
    }

    @BeforeEach
    void open() {
        desk = new Desk(db, rounds, LabelEvents.NONE);
    }

    @Test
    void aNewPoolSaysItsFirstBatchComesByItself() {
        Offer offer = desk.next("p", "ana", false);
        assertNull(offer.record());
        assertEquals("the first batch of this pool is being picked; it appears here by itself in a moment",
                offer.message());
    }

    @Test
    void afterAFailedRoundEachRoleIsToldTheWayOut() {
        // A pool that comes with a few labels, behind workers whose sampler diverges at every step
        // (plain SGLD with an absurd learning rate): its first round samples, and fails.
        StringBuilder csv = new StringBuilder("id,x,y\n");
        for (int i = 0; i < 12; i++) {
            csv.append('g').append(i).append(',').append(i * 0.5).append(',').append(i < 4 ? (i % 2 == 0 ? "a" : "b") : "")
                    .append('\n');
        }
        TestSupport.importText(db, "g", csv.toString(), TestSupport.csv("g").withId("id").withLabel("y")
                .withClasses(List.of("a", "b")));
        try (RoundWorkers broken = new RoundWorkers(db, TestSupport.quickSampler().toBuilder().kernel(KernelChoice.SGLD)
                .learningRate(1e30).build())) {
            Desk failing = new Desk(db, broken, LabelEvents.NONE);
            long pool = db.pools().require("g").id();
            // The first visit to the desk asks for the first round; it fails, and is not retried at once.
            assertNull(failing.next("g", "ana", false).record());
            TestSupport.await(Duration.ofSeconds(60), () -> !broken.worker("g").busy()
                    && db.rounds().latest(pool).map(r -> r.status() == RoundStatus.FAILED).orElse(false), "a failed round");
            String why = "no batch is served yet: the last round failed (" + db.rounds().latest(pool).orElseThrow().message()
                    + ")";
            assertEquals(why + "; ask a reviewer or an admin to start one from the pool's overview",
                    failing.next("g", "ana", false).message());
            assertEquals(why + "; once the cause is fixed, press Start a round now on the pool's overview",
                    failing.next("g", "lead", true).message());
            assertEquals(1, db.rounds().list(pool).size(), "asking again started the failing round again");
        }
    }
}
