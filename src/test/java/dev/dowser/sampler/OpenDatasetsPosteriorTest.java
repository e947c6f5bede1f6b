package dev.dowser.sampler;

import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.data.FeatureMatrix;
import dev.dowser.data.ImportProgress;
import dev.dowser.data.Importer;
import dev.dowser.data.LabelledSet;
import dev.dowser.stats.Metrics;
import dev.dowser.store.Database;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Posterior predictive accuracy with the whole training split labelled (70%, stratified), with
 * the default settings, on the open datasets: at least 0.95 on breast cancer and wine and 0.96 on
 * digits. These floors are common practice for a small MLP on these sets, not from one source.
 */
class OpenDatasetsPosteriorTest {

    @TempDir
    Path dir;

    private double accuracy(String name) throws IOException {
        TestSupport.OpenDataset ds = TestSupport.openDataset(name, dir);
        try (Database db = TestSupport.openDb(dir.resolve("db"))) {
            try (InputStream in = Files.newInputStream(ds.csv())) {
                new Importer(db).run(in, name, TestSupport.csv(name).withLabel("label"), ImportProgress.NONE);
            }
            LabelledSet all = LabelledSet.of(db, name, FeatureMatrix.load(db, name));
            PointEstimateTest.Fitted fit = PointEstimateTest.Fitted.of(all);
            return Metrics.accuracy(fit.predictive(), fit.test().labels(), all.classes().size());
        }
    }

    @Test
    void breastCancer() throws IOException {
        double a = accuracy("breast_cancer");
        assertTrue(a >= 0.95, "accuracy " + a);
    }

    @Test
    void wine() throws IOException {
        double a = accuracy("wine");
        assertTrue(a >= 0.95, "accuracy " + a);
    }

    @Test
    void digits() throws IOException {
        double a = accuracy("digits");
        assertTrue(a >= 0.96, "accuracy " + a);
    }
}
