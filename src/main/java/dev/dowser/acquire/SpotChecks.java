package dev.dowser.acquire;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.SplittableRandom;

/**
 * Spot checks: a share of each queue drawn uniformly at random from the unlabelled pool, not by
 * score, and flagged. Their labels give an estimate of accuracy that needs no weighting, since
 * records picked for being hard would make the model look worse than it is.
 */
public final class SpotChecks {

    public static final double DEFAULT_SHARE = 0.10;

    private SpotChecks() {
    }

    /**
     * One place in a queue: a candidate's position, whether it is a spot check, the probability
     * with which it was picked given the places picked before it (a spot check: 1 / the candidates
     * still free when it was drawn), and its place m in that sequence of picks (1 first; the picks
     * by score come first, then the spot checks in the order drawn), which an importance-weighted
     * estimate needs alongside the probability.
     */
    public record Entry(int candidate, boolean spotCheck, double probability, int order) {
    }

    /**
     * The queue: {@code round(share * size)} places go to spot checks drawn uniformly from the
     * candidates not already picked, spread evenly through the queue; the rest keep the picked order.
     */
    public static List<Entry> mix(Picks picked, int candidates, int size, double share, SplittableRandom rng) {
        if (!(share >= 0 && share <= 1)) {
            throw new IllegalArgumentException("the spot-check share must lie between 0 and 1, got " + share);
        }
        int checks = (int) Math.round(share * size);
        Set<Integer> taken = new HashSet<>();
        List<Entry> byScore = new ArrayList<>();
        for (int i = 0; i < picked.size(); i++) {
            int p = picked.positions()[i];
            if (byScore.size() < size - checks && taken.add(p)) {
                byScore.add(new Entry(p, false, picked.probabilities()[i], byScore.size() + 1));
            }
        }
        List<Entry> spot = new ArrayList<>();
        checks = Math.min(checks, candidates - taken.size());
        while (spot.size() < checks) {
            int free = candidates - taken.size();
            int c = rng.nextInt(candidates);
            if (taken.add(c)) {
                spot.add(new Entry(c, true, 1.0 / free, taken.size()));
            }
        }
        // Spot checks at evenly spaced places, floor((j + 1/2) total / checks), so an early stop still leaves some.
        int total = byScore.size() + spot.size();
        boolean[] spotAt = new boolean[total];
        for (int j = 0; j < spot.size(); j++) {
            spotAt[(int) ((j + 0.5) * total / spot.size())] = true;
        }
        List<Entry> queue = new ArrayList<>();
        int s = 0;
        int b = 0;
        for (int i = 0; i < total; i++) {
            queue.add(spotAt[i] ? spot.get(s++) : byScore.get(b++));
        }
        return queue;
    }
}
