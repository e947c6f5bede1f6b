package dev.dowser.stats;

import java.util.ArrayList;
import java.util.List;
import java.util.stream.IntStream;
import java.util.SplittableRandom;

/** Seeded splits of labelled rows. */
public final class Splits {

    /** The share held out for testing, per class, where a command or benchmark is not told otherwise. */
    public static final double DEFAULT_TEST_FRACTION = 0.3;

    private Splits() {
    }

    /** Train and test row indices. */
    public record Split(int[] train, int[] test) {
    }

    /**
     * A stratified split: within each class, rows are shuffled with the seed and round(fraction *
     * n_class) go to the test side, so both sides keep the class shares.
     */
    public static Split stratified(int[] labels, int classes, double testFraction, long seed) {
        return stratified(labels, classes, testFraction, new SplittableRandom(seed));
    }

    /** As above, shuffled with {@code rng}. */
    public static Split stratified(int[] labels, int classes, double testFraction, SplittableRandom rng) {
        if (!(testFraction > 0 && testFraction < 1)) {
            throw new IllegalArgumentException("the test fraction must lie strictly between 0 and 1, got "
                    + testFraction);
        }
        List<Integer> train = new ArrayList<>();
        List<Integer> test = new ArrayList<>();
        for (int k = 0; k < classes; k++) {
            final int cls = k;
            int[] rows = IntStream.range(0, labels.length).filter(i -> labels[i] == cls).toArray();
            RandomVariates.shuffle(rows, rng);
            int nTest = (int) Math.round(testFraction * rows.length);
            for (int i = 0; i < rows.length; i++) {
                (i < nTest ? test : train).add(rows[i]);
            }
        }
        return new Split(train.stream().mapToInt(Integer::intValue).sorted().toArray(),
                test.stream().mapToInt(Integer::intValue).sorted().toArray());
    }
}
