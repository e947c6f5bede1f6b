package dev.dowser.web;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.SplittableRandom;
import java.util.function.Consumer;
import java.util.function.ToIntFunction;

/**
 * Runs a check over generated inputs from one seed tree: the property's seed starts a
 * {@link SplittableRandom} whose draws are the seeds of the inputs, and each input is made from a
 * stream of its own seed, so any input can be made again from its seed alone
 * ({@code -Ddowser.fuzz.replay=SEED}). A failing input does not stop the run at once: the run
 * goes on (up to {@link #MAX_FAILURES} failures) and reports the smallest failing input it found,
 * with its seed, and how many failed.
 */
final class Tries {

    static final int MAX_FAILURES = 20;
    static final String REPLAY = "dowser.fuzz.replay";

    private Tries() {
    }

    /** The seed of property number {@code index} under {@code root}: the tree's first level. */
    static long propertySeed(long root, int index) {
        SplittableRandom tree = new SplittableRandom(root);
        long seed = tree.nextLong();
        for (int i = 0; i < index; i++) {
            seed = tree.nextLong();
        }
        return seed;
    }

    /** A failing input: its seed, its size, what it was and what went wrong. */
    record Failure(long seed, int size, String input, Throwable error) {
    }

    /**
     * Runs {@code check} on {@code tries} inputs of {@code gen} under {@code propertySeed}, or on the one
     * input of seed {@code dowser.fuzz.replay} when that is set; throws an AssertionError naming the
     * smallest failing input (by {@code size}) and its seed when any failed; {@code replayTest} is the
     * test to name in the report's replay command.
     */
    static <T> void run(String replayTest, long propertySeed, int tries, Gen<T> gen, ToIntFunction<T> size,
            Consumer<T> check) {
        String replay = System.getProperty(REPLAY);
        List<Failure> failures = new ArrayList<>();
        int done = 0;
        if (replay != null && !replay.isBlank()) {
            long seed = Long.parseLong(replay.trim());
            tryOne(gen, seed, size, check, failures);
            done = 1;
        } else {
            SplittableRandom seeds = new SplittableRandom(propertySeed);
            for (; done < tries && failures.size() < MAX_FAILURES; done++) {
                tryOne(gen, seeds.nextLong(), size, check, failures);
            }
        }
        if (!failures.isEmpty()) {
            Failure smallest = failures.stream().min(Comparator.comparingInt(Failure::size)).orElseThrow();
            throw new Failed(smallest.seed(), replayTest + ": " + failures.size() + " of " + done
                    + " inputs failed (property seed " + propertySeed + "; failing seeds "
                    + failures.stream().map(f -> Long.toString(f.seed())).toList() + "). The smallest (" + smallest.size()
                    + " bytes), seed " + smallest.seed() + " (replay: ./dowser test -Dtest=" + replayTest + " -D" + REPLAY + "="
                    + smallest.seed() + "):\n" + smallest.input() + "\nfailed with: " + smallest.error().getMessage(),
                    smallest.error());
        }
    }

    /** Some inputs failed; {@link #seed} is the seed of the smallest. */
    static final class Failed extends AssertionError {
        final long seed;

        Failed(long seed, String message, Throwable cause) {
            super(message, cause);
            this.seed = seed;
        }
    }

    /** The input of {@code seed}, made again: what a failure report's seed stands for. */
    static <T> T input(Gen<T> gen, long seed) {
        return gen.next(new SplittableRandom(seed));
    }

    private static <T> void tryOne(Gen<T> gen, long seed, ToIntFunction<T> size, Consumer<T> check,
            List<Failure> failures) {
        T input = input(gen, seed);
        try {
            check.accept(input);
        } catch (AssertionError | RuntimeException e) {
            failures.add(new Failure(seed, size.applyAsInt(input), String.valueOf(input), e));
        }
    }
}
