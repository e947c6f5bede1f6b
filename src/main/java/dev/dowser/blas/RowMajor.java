package dev.dowser.blas;

/** Row-major matrices: the one way their rows are gathered, below everything that gathers them. */
public final class RowMajor {

    private RowMajor() {
    }

    /** The given rows of a row-major matrix of {@code cols} columns, in that order. */
    public static float[] gather(float[] x, int cols, int[] rows) {
        float[] out = new float[rows.length * cols];
        gather(x, cols, rows, 0, rows.length, out);
        return out;
    }

    /**
     * Rows {@code rows[from]} to {@code rows[from + n - 1]} (or, when {@code rows} is null, the
     * consecutive rows {@code from} to {@code from + n - 1}) written into the start of {@code out}.
     */
    public static void gather(float[] x, int cols, int[] rows, int from, int n, float[] out) {
        if (rows == null) {
            System.arraycopy(x, from * cols, out, 0, n * cols);
            return;
        }
        for (int i = 0; i < n; i++) {
            System.arraycopy(x, rows[from + i] * cols, out, i * cols, cols);
        }
    }
}
