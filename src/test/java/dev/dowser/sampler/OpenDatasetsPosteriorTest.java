package dev.dowser.sampler;

import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.data.FeatureMatrix;
import dev.dowser.data.ImportProgress;
import dev.dowser.data.Importer;
import dev.dowser.data.LabelledSet;
import dev.dowser.stats.Metrics;
import dev.dowser.stats.Splits;
import dev.dowser.store.Database;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import dev.dowser.stats.SeedTree;
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
            int classes = all.classes().size();
            Splits.Split split = Splits.stratified(all.labels(), classes, 0.3, 1);
            LabelledSet train = all.subset(split.train());
            LabelledSet test = all.subset(split.test());
            RoundDraws s = new PosteriorSampler(SamplerConfig.defaults()).sample(train.x(), train.labels(), classes,
                    null, new float[0], SeedTree.of(1));
            float[] p = Predictive.meanProbabilities(s.layout(), s.draws(), test.x(), test.rows());
            return Metrics.accuracy(p, test.labels(), classes);
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
