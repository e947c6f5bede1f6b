package dev.dowser.simulate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import dev.dowser.TestSupport;
import dev.dowser.data.LabelledSet;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Strategy;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.concurrent.atomic.AtomicInteger;
import org.junit.jupiter.api.Test;

/**
 * Curves run side by side: a simulation gives the same points, in the same order, on one thread
 * as on several, since each curve draws only from its own seed's node of the seed tree.
 */
class ParallelSimulationTest {

    /** Every field of a point but its seconds, which measure the run, not the result. */
    private static List<String> withoutTimes(List<Simulation.Point> points) {
        return points.stream().map(p -> new Simulation.Point(p.strategy(), p.seed(), p.labels(), p.accuracy(), p.nll(),
                p.ece(), 0, p.agreement(), p.settled(), p.estimate()).toString()).toList();
    }

    /** On Fisher's iris, 3 strategies and 3 seeds (9 curves) on 1 and on 4 threads. */
    @Test
    void theThreadsChangeNothingButTheTime() {
        LabelledSet iris = TestSupport.labelledOpenDataset("iris", null);
        Simulation.Plan plan = new Simulation.Plan(List.of(Strategy.POWER, Strategy.BATCHBALD, Strategy.RANDOM), 3, 6,
                24, 0.3, PoolSettings.defaults().withBatchSize(6), TestSupport.quickSampler(), 1);
        List<String> reports = Collections.synchronizedList(new ArrayList<>());
        AtomicInteger ticks = new AtomicInteger();
        List<Simulation.Point> serial = Simulation.run(iris, null, plan, 1, k -> ticks.addAndGet(k),
                (done, points) -> { });
        List<Simulation.Point> parallel = Simulation.run(iris, null, plan, 4, k -> ticks.addAndGet(k),
                (done, points) -> reports.add(done + ":" + points.size()));
        // Rounds with a model at 6, 12, 18 and 24 labels: 4 points per curve, 12 per seed.
        assertEquals(36, serial.size());
        assertEquals(withoutTimes(serial), withoutTimes(parallel));
        assertEquals(List.of("1:12", "2:24", "3:36"), reports, "each seed is reported in order, once");
        assertEquals(2 * plan.roundsEach() * 9, ticks.get(), "every round of both runs ticked once");
    }

    @Test
    void noThreadsIsRefused() {
        LabelledSet iris = TestSupport.labelledOpenDataset("iris", null);
        Simulation.Plan plan = new Simulation.Plan(List.of(Strategy.RANDOM), 1, 6, 12, 0.3,
                PoolSettings.defaults().withBatchSize(6), TestSupport.quickSampler(), 1);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Simulation.run(iris, null, plan, 0, k -> { }, (done, points) -> { }));
        assertEquals("threads (curves run at once) must be at least 1, got 0", e.getMessage());
    }
}
