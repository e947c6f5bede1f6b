package dev.dowser.sampler;

/**
 * The rows a gradient is estimated from: {@code rows[0..size)}, or every row when {@code rows}
 * is null.
 */
public record Batch(int[] rows, int size) {

    public static Batch full(int n) {
        return new Batch(null, n);
    }

    public boolean isFull() {
        return rows == null;
    }
}
