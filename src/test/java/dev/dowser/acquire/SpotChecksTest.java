package dev.dowser.acquire;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** Spot checks: their share of the queue, their uniformity over the pool, and their place among the picks. */
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
    void eachPlaceKnowsItsTurnInThePicks() {
        // Picks by score come first, in their order, then the spot checks in the order drawn; each
        // spot check had 1 / (candidates still free) of being drawn.
        double[] q = {0.5, 0.25, 0.125, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1};
        List<SpotChecks.Entry> queue = SpotChecks.mix(new Picks(new int[] {4, 8, 15, 16, 23, 42, 7, 9, 11, 13}, q),
                50, 10, 0.2, new SplittableRandom(3));
        List<SpotChecks.Entry> byScore = queue.stream().filter(e -> !e.spotCheck()).toList();
        List<SpotChecks.Entry> spots = queue.stream().filter(SpotChecks.Entry::spotCheck).toList();
        for (int i = 0; i < byScore.size(); i++) {
            assertEquals(i + 1, byScore.get(i).order());
            assertEquals(q[i], byScore.get(i).probability());
        }
        assertEquals(9, spots.get(0).order());
        assertEquals(1.0 / 42, spots.get(0).probability(), 1e-15);
        assertEquals(10, spots.get(1).order());
        assertEquals(1.0 / 41, spots.get(1).probability(), 1e-15);
    }
}
