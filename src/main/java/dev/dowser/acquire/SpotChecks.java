package dev.dowser.acquire;

import dev.dowser.stats.Wilson;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.SplittableRandom;

/**
 * Spot checks: a share of each queue drawn uniformly at random from the unlabelled pool, not by
 * score, and flagged. Accuracy is estimated from spot-check labels alone, since records picked for
 * being hard give a biased estimate; the interval is Wilson's (1927).
 */
public final class SpotChecks {

    public static final double DEFAULT_SHARE = 0.10;

    private SpotChecks() {
    }

    /**
     * One place in a queue: a candidate's position, whether it is a spot check, and the probability
     * with which it was picked given the places picked before it (a spot check: 1 / the candidates
     * still free when it was drawn).
     */
    public record Entry(int candidate, boolean spotCheck, double probability) {
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
                byScore.add(new Entry(p, false, picked.probabilities()[i]));
            }
        }
        List<Entry> spot = new ArrayList<>();
        checks = Math.min(checks, candidates - taken.size());
        while (spot.size() < checks) {
            int free = candidates - taken.size();
            int c = rng.nextInt(candidates);
            if (taken.add(c)) {
                spot.add(new Entry(c, true, 1.0 / free));
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

    /** Accuracy on spot checks with its 95% Wilson interval. */
    public record Estimate(long correct, long checked, double accuracy, Wilson interval) {
    }

    /** From the model's predicted class at queue time and the label given, for spot-checked records only. */
    public static Estimate accuracy(int[] predicted, int[] given) {
        if (predicted.length != given.length) {
            throw new IllegalArgumentException(predicted.length + " predictions for " + given.length + " labels");
        }
        if (given.length == 0) {
            return new Estimate(0, 0, Double.NaN, null);
        }
        long correct = 0;
        for (int i = 0; i < given.length; i++) {
            correct += predicted[i] == given[i] ? 1 : 0;
        }
        return new Estimate(correct, given.length, (double) correct / given.length, Wilson.of95(correct, given.length));
    }
}
