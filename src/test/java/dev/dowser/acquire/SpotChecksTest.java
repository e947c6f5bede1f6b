package dev.dowser.acquire;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** Spot checks: their share of the queue, their uniformity over the pool, and the accuracy they estimate. */
class SpotChecksTest {

    @Test
    void aTenthOfTheQueueIsSpotChecksSpreadThrough() {
        int[] picked = {5, 9, 2, 7, 1, 3, 8, 4, 6, 0, 11, 12, 13, 14, 15, 16, 17, 18, 19, 20};
        List<SpotChecks.Entry> q = SpotChecks.mix(Picks.greedy(picked), 1_000, 20, SpotChecks.DEFAULT_SHARE, new SplittableRandom(1));
        assertEquals(20, q.size());
        long spots = q.stream().filter(SpotChecks.Entry::spotCheck).count();
        assertEquals(2, spots);
        Set<Integer> distinct = new HashSet<>();
        q.forEach(e -> distinct.add(e.candidate()));
        assertEquals(20, distinct.size(), "a record appears twice in the queue");
        // The picked records keep their order.
        List<Integer> byScore = q.stream().filter(e -> !e.spotCheck()).map(SpotChecks.Entry::candidate).toList();
        assertEquals(List.of(5, 9, 2, 7, 1, 3, 8, 4, 6, 0, 11, 12, 13, 14, 15, 16, 17, 18), byScore);
        assertTrue(q.subList(0, 10).stream().anyMatch(SpotChecks.Entry::spotCheck), "no spot check in the first half");
    }

    /** Uniform over the unpicked pool: a chi-square test over 10 equal bins against 27.88, the 0.1% point for 9 df. */
    @Test
    void spotChecksAreUniformOverThePool() {
        SplittableRandom rng = new SplittableRandom(2);
        int candidates = 100;
        int[] bins = new int[10];
        int trials = 20_000;
        for (int t = 0; t < trials; t++) {
            for (SpotChecks.Entry e : SpotChecks.mix(Picks.greedy(new int[] {}), candidates, 1, 1.0, rng)) {
                bins[e.candidate() / 10]++;
            }
        }
        double chi2 = 0;
        for (int b : bins) {
            chi2 += (b - trials / 10.0) * (b - trials / 10.0) / (trials / 10.0);
        }
        assertTrue(chi2 < 27.88, "chi-square " + chi2);
    }

    @Test
    void accuracyComesWithItsWilsonInterval() {
        // 81 of 263 right: Newcombe (1998), Table I, method 3 gives 0.2553 to 0.3662.
        int[] predicted = new int[263];
        int[] given = new int[263];
        for (int i = 0; i < 263; i++) {
            given[i] = i < 81 ? 0 : 1;
        }
        SpotChecks.Estimate e = SpotChecks.accuracy(predicted, given);
        assertEquals(81, e.correct());
        assertEquals(0.2553, e.interval().lower(), 5e-5);
        assertEquals(0.3662, e.interval().upper(), 5e-5);
    }
}
