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
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import dev.dowser.stats.SeedTree;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Warm starts measured on the open digits data (UCI optdigits as shipped by Debian's
 * python3-sklearn): labels arrive 10 at a time; after each batch, chains continued with a re-burn-in
 * of R steps are set against cold restarts with R and with 4R burn-in steps, on held-out accuracy
 * and NLL, each the mean of three seeds. A warm start must never be worse than a cold restart of
 * the same length in held-out NLL, the proper score, up to 0.02 nats of measurement noise;
 * accuracy on 540 test rows moves by one or two points between equally good runs (its standard
 * error is about 0.01), so it is printed, not compared. The tables are printed for the record.
 */
class WarmStartTest {

    static final int R = 100;
    static final int ROUNDS = 4;
    /** Each configuration runs with this many seeds, and the means are compared. */
    static final int SEEDS = 3;
    /** Draws kept per run, as many as the default, so that the runs are compared on well-averaged predictions. */
    static final int DRAWS = 64;

    @TempDir
    Path dir;

    record Score(double accuracy, double nll, double seconds) {
    }

    static String warmKernel(SamplerConfig config, int rows) {
        return PosteriorSampler.choose(config, rows).kernel().word();
    }

    static Score score(RoundDraws s, LabelledSet test, int classes) {
        float[] p = Predictive.meanProbabilities(s.layout(), s.draws(), test.x(), test.rows());
        return new Score(Metrics.accuracy(p, test.labels(), classes), Metrics.nll(p, test.labels(), classes),
                s.seconds());
    }

    static final double TOLERANCE = 0.02;

    @Test
    void malaWithFewLabels() throws IOException {
        compare(KernelChoice.AUTO, 50);
    }

    @Test
    void preconditionedSgldWithMoreLabels() throws IOException {
        compare(KernelChoice.PSGLD, 600);
    }

    private void compare(KernelChoice kernel, int startLabels) throws IOException {
        TestSupport.OpenDataset digits = TestSupport.openDataset("digits", dir);
        try (Database db = TestSupport.openDb(dir.resolve("db"))) {
            try (InputStream in = Files.newInputStream(digits.csv())) {
                new Importer(db).run(in, "digits", TestSupport.csv("digits").withLabel("label"), ImportProgress.NONE);
            }
            LabelledSet all = LabelledSet.of(db, "digits", FeatureMatrix.load(db, "digits"));
            int classes = 10;
            Splits.Split split = Splits.stratified(all.labels(), classes, 0.3, 7);
            LabelledSet test = all.subset(split.test());
            int[] order = split.train().clone();
            SplittableRandom rng = new SplittableRandom(8);
            for (int i = order.length - 1; i > 0; i--) {
                int j = rng.nextInt(i + 1);
                int t = order[i];
                order[i] = order[j];
                order[j] = t;
            }
            StringBuilder table = new StringBuilder("labels  warm(R) acc/nll/s   cold(R) acc/nll/s   cold(4R) acc/nll/s\n");
            int rounds = ROUNDS;
            double[][][] scores = new double[SEEDS][rounds][];
            for (int seed = 0; seed < SEEDS; seed++) {
                SamplerConfig base = SamplerConfig.builder().chains(4, DRAWS).burnInSteps(R).reburnInSteps(R)
                        .thinSteps(10).kernel(kernel).build();
                int labelled = startLabels;
                LabelledSet train = all.subset(Arrays.copyOf(order, labelled));
                List<State<?>> chains = new PosteriorSampler(base.toBuilder().burnInSteps(4 * R).build())
                        .sample(train.x(), train.labels(), classes, null, new float[0], SeedTree.of(9 + seed).child(0)).lastStates();
                for (int round = 1; round <= rounds; round++) {
                    labelled += 10;
                    train = all.subset(Arrays.copyOf(order, labelled));
                    RoundDraws warm = new PosteriorSampler(base).sample(train.x(), train.labels(), classes, chains,
                            new float[0], SeedTree.of(9 + seed).child(round));
                    chains = warm.lastStates();
                    RoundDraws coldR = new PosteriorSampler(base).sample(train.x(), train.labels(), classes, null,
                            new float[0], SeedTree.of(9 + seed).child(round));
                    RoundDraws cold4R = new PosteriorSampler(base.toBuilder().burnInSteps(4 * R).build()).sample(train.x(),
                            train.labels(), classes, null, new float[0], SeedTree.of(9 + seed).child(round));
                    Score w = score(warm, test, classes);
                    Score c = score(coldR, test, classes);
                    Score c4 = score(cold4R, test, classes);
                    scores[seed][round - 1] = new double[] {w.accuracy(), w.nll(), w.seconds(), c.accuracy(), c.nll(),
                        c.seconds(), c4.accuracy(), c4.nll(), c4.seconds()};
                }
            }
            for (int round = 0; round < rounds; round++) {
                double[] mean = new double[9];
                for (int seed = 0; seed < SEEDS; seed++) {
                    for (int k = 0; k < 9; k++) {
                        mean[k] += scores[seed][round][k] / SEEDS;
                    }
                }
                table.append(String.format("%6d  %.3f/%.3f/%.2f   %.3f/%.3f/%.2f   %.3f/%.3f/%.2f%n",
                        startLabels + 10 * (round + 1), mean[0], mean[1], mean[2], mean[3], mean[4], mean[5], mean[6],
                        mean[7], mean[8]));
                assertTrue(mean[1] <= mean[4] + TOLERANCE, "round " + (round + 1) + ": warm NLL " + mean[1]
                        + " is worse than cold " + mean[4] + "\n" + table);
            }
            SamplerConfig base = SamplerConfig.builder().kernel(kernel).build();
            int labelled = startLabels + 10 * rounds;
            System.out.println("Warm starts on digits, R = " + R + " steps (" + warmKernel(base, labelled)
                    + ", 4 chains, " + DRAWS + " draws):\n" + table);
        }
    }
}
