package dev.dowser.rounds;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.data.FeatureMatrix;
import dev.dowser.data.ImportProgress;
import dev.dowser.data.Importer;
import dev.dowser.sampler.KernelChoice;
import dev.dowser.sampler.Sample;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.store.Database;
import dev.dowser.store.SavedChain;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Chains saved after a round are continued by the next, also after the database is closed and reopened. */
class PoolPosteriorTest {

    @TempDir
    Path dir;

    static SamplerConfig config() {
        return SamplerConfig.defaults(5).withHidden(List.of(16)).withChains(2, 8).withSteps(200, 50, 10)
                .withKernel(KernelChoice.PSGLD);
    }

    @Test
    void aRestartContinuesWhereTheChainsStopped() throws IOException {
        // Iris (Fisher 1936), as shipped by Debian's python3-sklearn: 150 labelled records.
        TestSupport.OpenDataset iris = TestSupport.openDataset("iris", dir);
        Path data = dir.resolve("db");
        long stepsAfterFirst;
        try (Database db = TestSupport.openDb(data)) {
            try (InputStream in = Files.newInputStream(iris.csv())) {
                new Importer(db).run(in, "iris.csv", TestSupport.csv("iris").withLabel("label"), ImportProgress.NONE);
            }
            Sample first = new PoolPosterior(db, config()).sampleRound("iris", FeatureMatrix.load(db, "iris"),
                    new float[0]);
            assertFalse(first.warmStart());
            stepsAfterFirst = first.lastStates().get(0).step();
            List<SavedChain> saved = db.chains().load(db.pools().require("iris").id());
            assertEquals(2, saved.size());
            assertEquals(0, saved.get(0).round());
            assertEquals(stepsAfterFirst, saved.get(0).step());
            assertTrue(saved.get(0).preconditioner() != null, "preconditioned SGLD keeps its preconditioner");
        }
        try (Database db = TestSupport.openDb(data)) {
            Sample second = new PoolPosterior(db, config()).sampleRound("iris", FeatureMatrix.load(db, "iris"),
                    new float[0]);
            assertTrue(second.warmStart(), "the second round should continue the saved chains");
            assertEquals(stepsAfterFirst + 50 + 4 * 10, second.lastStates().get(0).step());
            assertEquals(1, db.chains().load(db.pools().require("iris").id()).get(0).round());
        }
    }

    @Test
    void aDifferentNetworkStartsAfresh() throws IOException {
        TestSupport.OpenDataset iris = TestSupport.openDataset("iris", dir);
        try (Database db = TestSupport.openDb(dir.resolve("db"))) {
            try (InputStream in = Files.newInputStream(iris.csv())) {
                new Importer(db).run(in, "iris.csv", TestSupport.csv("iris").withLabel("label"), ImportProgress.NONE);
            }
            FeatureMatrix m = FeatureMatrix.load(db, "iris");
            new PoolPosterior(db, config()).sampleRound("iris", m, new float[0]);
            Sample wider = new PoolPosterior(db, config().withHidden(List.of(32))).sampleRound("iris", m, new float[0]);
            assertFalse(wider.warmStart(), "chains of a 16-unit network cannot continue as a 32-unit one");
        }
    }
}
