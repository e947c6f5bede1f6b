package dev.dowser.acquire;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import java.io.IOException;
import java.nio.file.Files;
import java.util.Arrays;
import java.util.HashSet;
import java.util.Set;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * TypiClust's first batch covers the dense regions and leaves outliers alone, where k-means++
 * seeding, which weighs records by squared distance, favours them (Hacohen, Dekel & Weinshall
 * 2022, section 3.2 and figure 2 make this contrast).
 */
class ColdStartTest {

    /** Three Gaussian blobs of 200 (sd 1, centres 10 apart in 2-d) and 4 outliers 50 from the origin. */
    private static float[] blobsWithOutliers(SplittableRandom rng) {
        float[] x = new float[(600 + 4) * 2];
        double[][] centres = {{0, 0}, {10, 0}, {0, 10}};
        for (int i = 0; i < 600; i++) {
            x[2 * i] = (float) (centres[i / 200][0] + rng.nextGaussian());
            x[2 * i + 1] = (float) (centres[i / 200][1] + rng.nextGaussian());
        }
        for (int j = 0; j < 4; j++) {
            double angle = 2 * Math.PI * j / 4 + 0.5;
            x[2 * (600 + j)] = (float) (50 * Math.cos(angle));
            x[2 * (600 + j) + 1] = (float) (50 * Math.sin(angle));
        }
        return x;
    }

    @Test
    void typiClustTakesTheMostTypicalRecordOfEachDenseCluster() {
        SplittableRandom rng = new SplittableRandom(11);
        int outliersByKmeansPlusPlus = 0;
        double distanceSum = 0;
        for (int trial = 0; trial < 20; trial++) {
            float[] x = blobsWithOutliers(rng);
            int[] typical = ColdStart.typiClust(x, 604, 2, 3, rng);
            Set<Integer> blobs = new HashSet<>();
            for (int r : typical) {
                assertTrue(r < 600, "TypiClust picked outlier " + r);
                blobs.add(r / 200);
                double dx = x[2 * r] - new double[] {0, 10, 0}[r / 200];
                double dy = x[2 * r + 1] - new double[] {0, 0, 10}[r / 200];
                distanceSum += Math.hypot(dx, dy);
                assertTrue(Math.hypot(dx, dy) < 2, "picked " + Math.hypot(dx, dy) + " from its blob's centre");
            }
            assertEquals(3, blobs.size(), "one record from each blob: " + Arrays.toString(typical));
            for (int r : ColdStart.kmeansPlusPlus(x, 604, 2, 3, rng)) {
                outliersByKmeansPlusPlus += r >= 600 ? 1 : 0;
            }
        }
        // The most typical record of a unit Gaussian blob sits near its centre: a record drawn at random
        // would lie sqrt(pi / 2) = 1.25 from it on average (the Rayleigh distribution's mean).
        assertTrue(distanceSum / 60 < 0.6, "mean distance from the centre " + distanceSum / 60);
        // The D^2 weighting favours the outliers: a uniform pick would take 60 x 4 / 604 = 0.4 of them
        // in 20 batches of 3; k-means++ takes at least ten times that.
        assertTrue(outliersByKmeansPlusPlus >= 4, "k-means++ picked " + outliersByKmeansPlusPlus + " outliers");
    }

    /** Fisher's iris (1936) as Debian's python3-sklearn ships it: 150 rows of 4 measurements in cm, species 0-2. */
    private static float[] iris(int[] species) throws IOException {
        var lines = Files.readAllLines(TestSupport.datasetsDir().resolve("iris.csv"));
        float[] x = new float[150 * 4];
        for (int i = 0; i < 150; i++) {
            String[] f = lines.get(i + 1).split(",");
            for (int j = 0; j < 4; j++) {
                x[i * 4 + j] = Float.parseFloat(f[j]);
            }
            species[i] = Integer.parseInt(f[4]);
        }
        return x;
    }

    /**
     * On iris, k-means with k = 3 is a textbook case: its best partition has a within-cluster sum of
     * squares of 78.85 (cm^2; the value scikit-learn's k-means reports on the raw measurements, from
     * memory), puts the 50 setosa alone in one cluster (setosa is linearly separable from the others,
     * Fisher 1936), and splits versicolor from virginica with a few errors: a cluster of about 62
     * (mostly versicolor) and one of about 38 (mostly virginica). TypiClust with a batch of 3 should
     * therefore take one flower of each species, the largest cluster's first, on every seed.
     */
    @Test
    void onIrisTypiClustTakesOneFlowerOfEachSpeciesLargestClusterFirst() throws IOException {
        int[] species = new int[150];
        float[] x = iris(species);
        for (int seed = 0; seed < 10; seed++) {
            int[] cluster = KMeans.cluster(x, 150, 4, 3, new SplittableRandom(seed));
            double inertia = 0;
            int[][] members = KMeans.members(cluster, 3);
            for (int[] m : members) {
                inertia += withinSumOfSquares(x, m);
            }
            assertEquals(78.85, inertia, 0.01, "seed " + seed + ": k-means' sum of squares on iris");
            Set<Integer> setosaClusters = new HashSet<>();
            for (int r = 0; r < 150; r++) {
                if (species[r] == 0) {
                    setosaClusters.add(cluster[r]);
                }
            }
            assertEquals(1, setosaClusters.size(), "setosa split over clusters " + setosaClusters);
            int setosaCluster = setosaClusters.iterator().next();
            assertEquals(50, members[setosaCluster].length, "setosa's cluster holds only setosa");

            int[] picked = ColdStart.typiClust(x, 150, 4, 3, new SplittableRandom(seed));
            int[] kinds = Arrays.stream(picked).map(r -> species[r]).toArray();
            assertEquals(Set.of(0, 1, 2), Arrays.stream(kinds).boxed().collect(java.util.stream.Collectors.toSet()),
                    "seed " + seed + ": species of the first batch " + Arrays.toString(kinds));
            assertEquals(1, kinds[0], "seed " + seed + ": the largest cluster (mostly versicolor) comes first");
        }
    }

    private static double withinSumOfSquares(float[] x, int[] rows) {
        double s = 0;
        for (int j = 0; j < 4; j++) {
            double mean = 0;
            for (int r : rows) {
                mean += x[r * 4 + j];
            }
            mean /= rows.length;
            for (int r : rows) {
                s += (x[r * 4 + j] - mean) * (x[r * 4 + j] - mean);
            }
        }
        return s;
    }

    @Test
    void moreClustersThanDistinctRecordsStillFillsTheBatch() {
        float[] x = {1, 1, 1, 1, 2, 2};
        int[] picked = ColdStart.typiClust(x, 3, 2, 3, new SplittableRandom(1));
        assertEquals(3, Arrays.stream(picked).distinct().count());
    }
}
