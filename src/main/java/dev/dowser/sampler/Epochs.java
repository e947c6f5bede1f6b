package dev.dowser.sampler;

import dev.dowser.stats.RandomVariates;
import java.util.SplittableRandom;

/** Mini-batches of a data set's rows: the next n of an epoch order, reshuffled when used up. */
final class Epochs {

    private final int[] order;
    private final SplittableRandom rng;
    private int cursor;

    Epochs(int rows, SplittableRandom rng) {
        this.order = new int[rows];
        for (int i = 0; i < rows; i++) {
            order[i] = i;
        }
        this.rng = rng;
        this.cursor = rows;
    }

    int rows() {
        return order.length;
    }

    /** The next n rows (n at most the data set's size). */
    Batch next(int n) {
        if (cursor + n > order.length) {
            RandomVariates.shuffle(order, rng);
            cursor = 0;
        }
        int[] rows = new int[n];
        System.arraycopy(order, cursor, rows, 0, n);
        cursor += n;
        return new Batch(rows, n);
    }
}
