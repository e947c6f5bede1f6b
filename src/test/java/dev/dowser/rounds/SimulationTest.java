package dev.dowser.rounds;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.data.FeatureMatrix;
import dev.dowser.data.ImportProgress;
import dev.dowser.data.Importer;
import dev.dowser.data.LabelledSet;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.store.Database;
import java.io.IOException;
import java.io.InputStream;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The offline loop on the open digits data (UCI optdigits as shipped by Debian's python3-sklearn,
 * 1797 x 64, 10 classes): batch 10, budget 300, 3 seeds. Picking by BALD must reach 90% test
 * accuracy with fewer labels than picking at random; the figures are printed for the record.
 */
class SimulationTest {

    @TempDir
    Path dir;

    @Test
    void baldReaches90PercentOnDigitsWithFewerLabelsThanRandom() throws IOException {
        TestSupport.OpenDataset digits = TestSupport.openDataset("digits", dir);
        try (Database db = TestSupport.openDb(dir.resolve("db"))) {
            try (InputStream in = Files.newInputStream(digits.csv())) {
                new Importer(db).run(in, "digits", TestSupport.csv("digits").withLabel("label"), ImportProgress.NONE);
            }
            LabelledSet all = LabelledSet.of(db, "digits", FeatureMatrix.load(db, "digits"));
            SamplerConfig sampler = SamplerConfig.builder().chains(4, 32).burnInSteps(300).reburnInSteps(200)
                    .thinSteps(10).build();
            Simulation.Plan plan = new Simulation.Plan(List.of(Strategy.BALD, Strategy.RANDOM), 3, 20, 300, 0.3,
                    PoolSettings.defaults(), sampler, 1);
            List<Simulation.Point> points = Simulation.run(all, plan, k -> { });
            assertEquals((plan.roundsEach() - 1) * 2 * 3, points.size(), "a point for every round with a model");
            StringWriter table = new StringWriter();
            SimulationReport.summary(new PrintWriter(table), points, plan, List.of(0.9));
            System.out.println("Simulation on digits, batch 10, budget 300, 3 seeds:\n" + table);
            int bald = Simulation.labelsToReach(points, Strategy.BALD, 3, 0.9);
            int random = Simulation.labelsToReach(points, Strategy.RANDOM, 3, 0.9);
            assertTrue(bald > 0, "BALD never reached 90%\n" + table);
            assertTrue(random < 0 || bald < random, "BALD needed " + bald + " labels, random " + random + "\n" + table);

            SimulationReport.write(dir.resolve("out"), points, plan);
            assertTrue(Files.readString(dir.resolve("out").resolve(SimulationReport.SVG)).startsWith("<svg"));
            assertTrue(Files.size(dir.resolve("out").resolve(SimulationReport.PNG)) > 1_000);
            assertEquals(points.size() + 1, Files.readAllLines(dir.resolve("out").resolve(SimulationReport.CSV)).size());
        }
    }

    @Test
    void labelsToReachIsTheMedianOverSeeds() {
        List<Simulation.Point> pts = List.of(
                new Simulation.Point(Strategy.BALD, 0, 50, 0.95, 0, 0, 0),
                new Simulation.Point(Strategy.BALD, 1, 60, 0.91, 0, 0, 0),
                new Simulation.Point(Strategy.BALD, 1, 40, 0.80, 0, 0, 0),
                new Simulation.Point(Strategy.BALD, 2, 90, 0.85, 0, 0, 0));
        // Seeds reach 0.9 at 50, 60 and never: the median of {50, 60, never} is 60.
        assertEquals(60, Simulation.labelsToReach(pts, Strategy.BALD, 3, 0.9));
        assertEquals(-1, Simulation.labelsToReach(pts, Strategy.BALD, 3, 0.99));
        assertEquals("0.9", SimulationReport.targetName(0.9));
        assertEquals("0.95", SimulationReport.targetName(0.95));
    }
}
