package dev.dowser.stats;

import java.util.SplittableRandom;

/**
 * One seed tree per run: every consumer of random numbers (a pool, a round, a chain, a picker)
 * draws from its own branch, named by a path of small numbers from the root, so adding a consumer
 * or reordering the work never shifts another's stream, and no offsets such as {@code seed * 31 +
 * round} can collide. A child's seed is the parent's mixed with the branch number by SplitMix64's
 * finaliser (Steele, Lea & Flood 2014, "Fast Splittable Pseudorandom Number Generators"), so
 * neighbouring branches give unrelated streams.
 *
 * @param seed this node's seed; {@link #rng()} starts its generator from it
 */
public record SeedTree(long seed) {

    private static final long GOLDEN_GAMMA = 0x9E3779B97F4A7C15L;

    /** The root of a tree for a seed a person chose. */
    public static SeedTree of(long seed) {
        return new SeedTree(mix(seed));
    }

    /** The branch numbered {@code branch} below this node. */
    public SeedTree child(long branch) {
        return new SeedTree(mix(seed + GOLDEN_GAMMA * (branch + 1)));
    }

    /** A generator for this node's own use. */
    public SplittableRandom rng() {
        return new SplittableRandom(seed);
    }

    /** SplitMix64's finaliser (mix64 variant 13). */
    static long mix(long z) {
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }
}
