package dev.dowser.acquire;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

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

    @Test
    void moreClustersThanDistinctRecordsStillFillsTheBatch() {
        float[] x = {1, 1, 1, 1, 2, 2};
        int[] picked = ColdStart.typiClust(x, 3, 2, 3, new SplittableRandom(1));
        assertEquals(3, Arrays.stream(picked).distinct().count());
    }
}
