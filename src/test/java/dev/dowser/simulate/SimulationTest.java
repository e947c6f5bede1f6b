package dev.dowser.simulate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.data.FeatureMatrix;
import dev.dowser.data.ImportProgress;
import dev.dowser.data.Importer;
import dev.dowser.data.LabelledSet;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Strategy;
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
            LearningCurves lc = LearningCurves.of(points, plan.strategies(), plan.seeds());
            int bald = lc.labelsToReach(Strategy.BALD, 0.9);
            int random = lc.labelsToReach(Strategy.RANDOM, 0.9);
            assertTrue(bald > 0, "BALD never reached 90%\n" + table);
            assertTrue(random < 0 || bald < random, "BALD needed " + bald + " labels, random " + random + "\n" + table);

            SimulationReport.write(dir.resolve("out"), "digits", points, plan);
            assertTrue(Files.readString(dir.resolve("out").resolve(SimulationReport.SVG)).startsWith("<svg"));
            assertTrue(Files.size(dir.resolve("out").resolve(SimulationReport.PNG)) > 1_000);
            assertEquals(points.size() + 1, Files.readAllLines(dir.resolve("out").resolve(SimulationReport.CSV)).size());
        }
    }
}
