package dev.dowser.desk;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;

import dev.dowser.TestSupport;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Strategy;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.store.NotFoundException;
import dev.dowser.store.PoolRow;
import dev.dowser.store.RoundStore;
import java.util.List;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;

/** The overview's service: rounds page by page with chain health, settings changed field by field, records. */
class OverviewTest extends PoolFixture {

    Overview overview;
    final SamplerConfig server = TestSupport.quickSampler();

    @Override
    String records() {
        StringBuilder csv = new StringBuilder();
        for (int i = 0; i < 12; i++) {
            csv.append("r").append(i).append(',').append(i * 0.5).append('\n');
        }
        return csv.toString();
    }

    @BeforeEach
    void open() {
        overview = new Overview(db, rounds);
    }

    @Test
    void roundsComeNewestFirstAPageAtATimeWithTheirChainHealthInWords() {
        PoolRow pool = db.pools().require("p");
        String health = "{\"rhatMax\":1.6,\"essBulkMin\":5,\"essTailMin\":4,\"divergences\":0}";
        for (int r = 1; r <= 5; r++) {
            db.rounds().start(pool.id(), r, 10L * r, new RoundStore.Inputs(r, "{\"chains\":2,\"draws\":8}", null, 0,
                    null));
            if (r < 5) {
                db.rounds().finish(pool.id(), r, "mala", "written by the test", health);
            }
        }
        Overview.RoundsPage first = overview.rounds("p", 0, 2);
        assertEquals(5, first.total());
        assertEquals(List.of(5, 4), first.rounds().stream().map(l -> l.round().round()).toList());
        assertNull(first.rounds().get(0).chains(), "a running round has no chain health yet");
        assertNotNull(first.rounds().get(1).chains().summary());
        Overview.RoundsPage last = overview.rounds("p", 4, 2);
        assertEquals(List.of(1), last.rounds().stream().map(l -> l.round().round()).toList());
        assertEquals(0, overview.rounds("p", 5, 2).rounds().size());
        assertEquals(PoolSettings.DEFAULT_BATCH_SIZE, first.progress().labelsToNextRound());
        IllegalArgumentException wide = assertThrows(IllegalArgumentException.class,
                () -> overview.rounds("p", 0, Overview.MAX_ROUNDS_PAGE + 1));
        assertEquals("offset must be 0 or more and limit 1 to 200, got offset 0 and limit 201", wide.getMessage());
        NotFoundException unknown = assertThrows(NotFoundException.class, () -> overview.rounds("q", 0, 1));
        assertEquals("no pool named 'q'", unknown.getMessage());
    }

    @Test
    void aChangeKeepsWhatItDoesNotNameAndTheHistoryKeepsEveryChange() {
        Overview.Settings start = overview.settings("p");
        assertEquals(PoolSettings.defaults(), start.settings());
        assertEquals(PoolSettings.Sampling.of(server), start.sampling(), "the server's sampling until the pool has its own");

        Overview.Settings batch = overview.changeSettings("p",
                new PoolSettings.Change(4, null, null, Strategy.POWER, null, null, null, null, null, null, null), "lead");
        assertEquals(4, batch.settings().batchSize());
        assertEquals(Strategy.POWER, batch.settings().strategy());
        assertEquals(PoolSettings.DEFAULT_LEASE_MINUTES, batch.settings().leaseMinutes());
        assertNull(batch.settings().sampling(), "naming no sampler setting keeps the server's");
        assertEquals(4, rounds.worker("p").labelsToNextRound(), "the worker hears of the new batch size");

        // Draws alone: the chains and warm-up in force (the server's) come with them.
        Overview.Settings draws = overview.changeSettings("p",
                new PoolSettings.Change(null, null, null, null, null, null, 16, null, null, null, null), "lead");
        assertEquals(new PoolSettings.Sampling(server.chains().count(), 16, server.steps().reburnInSteps()), draws.sampling());

        IllegalArgumentException uneven = assertThrows(IllegalArgumentException.class, () -> overview.changeSettings(
                "p", new PoolSettings.Change(null, null, null, null, null, 4, 30, null, null, null, null), "lead"));
        assertEquals("draws must be a multiple of the chains (4) from 4 to 512, so every chain keeps as many; got 30",
                uneven.getMessage());
        assertEquals(draws, overview.settings("p"), "a refused change changes nothing");

        List<Overview.SettingsChange> history = overview.settingsHistory("p");
        assertEquals(2, history.size());
        assertEquals("lead", history.get(0).by());
        assertEquals(PoolSettings.DEFAULT_BATCH_SIZE, history.get(0).before().settings().batchSize());
        assertEquals(4, history.get(0).after().settings().batchSize());
        assertEquals(batch, history.get(1).before());
        assertEquals(draws, history.get(1).after());
    }

    @Test
    void recordsComeInPoolOrderAPageAtATime() {
        Overview.RecordsPage page = overview.records("p", 10, 5);
        assertEquals(12, page.total());
        assertEquals(List.of("r10", "r11"), page.records().stream().map(RecordView::id).toList());
        assertEquals("5.5", page.records().get(1).fields().get("x"));
        assertNull(page.records().get(1).label());
    }
}
