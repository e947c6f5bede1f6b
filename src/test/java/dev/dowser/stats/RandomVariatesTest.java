package dev.dowser.stats;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.stat.inference.ChiSquareTest;
import org.junit.jupiter.api.Test;

/**
 * The one partial and the one whole Fisher-Yates shuffle draw what they say, uniformly: Pearson's
 * chi-square against equal counts, computed by Apache Commons Math 3.6.1 (Maven Central), at a level
 * of 0.001 with fixed seeds.
 */
class RandomVariatesTest {

    private static final double LEVEL = 0.001;
    private static final int DRAWS = 30_000;

    @Test
    void aSampleIsUniformWithoutReplacementInTheOrderDrawn() {
        int[] among = {10, 11, 12, 13, 14, 15, 16, 17, 18, 19};
        int k = 3;
        SplittableRandom rng = new SplittableRandom(7);
        long[] first = new long[among.length];
        long[] second = new long[among.length];
        long[] anywhere = new long[among.length];
        for (int d = 0; d < DRAWS; d++) {
            int[] s = RandomVariates.sample(among, k, rng);
            assertEquals(k, s.length);
            assertEquals(k, Arrays.stream(s).distinct().count(), "drawn without replacement: " + Arrays.toString(s));
            first[s[0] - 10]++;
            second[s[1] - 10]++;
            for (int v : s) {
                anywhere[v - 10]++;
            }
        }
        // Every place of the draw is uniform over the records, so each record is in k / n of the samples.
        assertUniform(first);
        assertUniform(second);
        assertUniform(anywhere);
        assertArrayEquals(new int[] {10, 11, 12, 13, 14, 15, 16, 17, 18, 19}, among, "the records given stay as they were");
    }

    @Test
    void askingForMoreThanThereAreGivesThemAllInSomeOrder() {
        int[] all = RandomVariates.sample(new int[] {4, 2, 9}, 5, new SplittableRandom(1));
        Arrays.sort(all);
        assertArrayEquals(new int[] {2, 4, 9}, all);
        assertEquals(0, RandomVariates.sample(new int[] {4, 2, 9}, 0, new SplittableRandom(1)).length);
    }

    @Test
    void aShuffleMakesEveryOrderEquallyLikely() {
        // The six orders of three, counted by their index in lexicographic order.
        long[] orders = new long[6];
        SplittableRandom rng = new SplittableRandom(11);
        for (int d = 0; d < DRAWS; d++) {
            int[] a = {0, 1, 2};
            RandomVariates.shuffle(a, rng);
            orders[2 * a[0] + (a[1] > a[2] ? 1 : 0)]++;
        }
        assertUniform(orders);
    }

    private static void assertUniform(long[] counts) {
        double[] expected = new double[counts.length];
        Arrays.fill(expected, (double) Arrays.stream(counts).sum() / counts.length);
        double statistic = new ChiSquareTest().chiSquare(expected, counts);
        double critical = new ChiSquaredDistribution(counts.length - 1).inverseCumulativeProbability(1 - LEVEL);
        assertTrue(statistic < critical, "chi-square " + statistic + " >= " + critical + " for " + Arrays.toString(counts));
    }
}
