package dev.dowser.model;

import dev.dowser.blas.Blas;
import dev.dowser.blas.RowMajor;

/**
 * The network's forward pass and the gradient of its log-likelihood, hand-derived, batched over
 * rows with the matrix products on BLAS. An instance holds work buffers for up to
 * {@code maxRows} rows at a time and is used by one thread; larger sets are taken in chunks.
 *
 * <p>For rows X (n x d) and labels y: A_0 = X; Z_l = A_{l-1} W_l + b_l; A_l = f(Z_l) for hidden
 * layers; the last Z is the logits z, and log p(y | x) = z_y - logsumexp(z). Backwards, with
 * delta_L = onehot(y) - softmax(z): dW_l = A_{l-1}^T delta_l, db_l = column sums of delta_l,
 * delta_{l-1} = (delta_l W_l^T) * f'(Z_{l-1}). Sums of logs are kept in double.
 */
public final class Mlp {

    private final Layout layout;
    private final Architecture arch;
    private final int maxRows;
    /** acts[0] holds the gathered input rows; acts[l] the outputs of layer l (the last: logits). */
    private final float[][] acts;
    private final float[] delta;
    private final float[] deltaPrev;

    public Mlp(Layout layout, int maxRows) {
        if (maxRows < 1) {
            throw new IllegalArgumentException("maxRows must be at least 1, got " + maxRows);
        }
        this.layout = layout;
        this.arch = layout.architecture();
        this.maxRows = maxRows;
        int layers = arch.layers();
        acts = new float[layers + 1][];
        acts[0] = new float[maxRows * arch.inputs()];
        for (int l = 0; l < layers; l++) {
            acts[l + 1] = new float[maxRows * arch.fanOut(l)];
        }
        delta = new float[maxRows * arch.widest()];
        deltaPrev = new float[maxRows * arch.widest()];
    }

    public Layout layout() {
        return layout;
    }

    public int maxRows() {
        return maxRows;
    }

    /**
     * Sum over the given rows of log p(y_i | x_i, theta); when {@code grad} is not null, adds
     * {@code gradScale} times the gradient of that sum to it.
     *
     * @param x      all rows' features, row-major, {@code inputs} per row
     * @param labels all rows' class indices
     * @param rows   which rows: {@code rows[from..from+count)}, or rows {@code from..from+count) when null
     */
    public double logLikelihood(float[] theta, float[] x, int[] labels, int[] rows, int from, int count,
                                float[] grad, float gradScale) {
        double sum = 0;
        for (int start = 0; start < count; start += maxRows) {
            int n = Math.min(maxRows, count - start);
            gather(x, rows, from + start, n);
            forward(theta, n);
            sum += logSoftmaxBackward(labels, rows, from + start, n, grad != null ? gradScale : 0f);
            if (grad != null) {
                backward(theta, n, grad);
            }
        }
        return sum;
    }

    /** Class probabilities of rows {@code from..from+count)} of x, into {@code out} (count x classes). */
    public void probabilities(float[] theta, float[] x, int from, int count, float[] out) {
        int c = arch.classes();
        for (int start = 0; start < count; start += maxRows) {
            int n = Math.min(maxRows, count - start);
            gather(x, null, from + start, n);
            forward(theta, n);
            float[] z = acts[arch.layers()];
            for (int i = 0; i < n; i++) {
                softmax(z, i * c, c, out, (start + i) * c);
            }
        }
    }

    private void gather(float[] x, int[] rows, int from, int n) {
        RowMajor.gather(x, arch.inputs(), rows, from, n, acts[0]);
    }

    private void forward(float[] theta, int n) {
        int layers = arch.layers();
        for (int l = 0; l < layers; l++) {
            int in = arch.fanIn(l);
            int out = arch.fanOut(l);
            float[] z = acts[l + 1];
            // Z_l = b_l broadcast, then Z_l += A_{l-1} W_l
            int b0 = layout.biasOffset(l);
            for (int i = 0; i < n; i++) {
                System.arraycopy(theta, b0, z, i * out, out);
            }
            Blas.gemm(false, false, n, out, in, 1f, acts[l], 0, in, theta, layout.weightOffset(l), out, 1f, z, 0, out);
            if (l < layers - 1) {
                arch.activation().apply(z, 0, n * out);
            }
        }
    }

    /** Returns the rows' log-likelihood and leaves scale * (onehot(y) - p) in {@code delta}. */
    private double logSoftmaxBackward(int[] labels, int[] rows, int from, int n, float scale) {
        int c = arch.classes();
        float[] z = acts[arch.layers()];
        double sum = 0;
        for (int i = 0; i < n; i++) {
            int y = labels[rows == null ? from + i : rows[from + i]];
            int o = i * c;
            double max = Double.NEGATIVE_INFINITY;
            for (int k = 0; k < c; k++) {
                max = Math.max(max, z[o + k]);
            }
            // exp once per class: e_k = exp(z_k - max), p_k = e_k / sum e, log p_y = z_y - max - log sum e.
            double s = 0;
            for (int k = 0; k < c; k++) {
                double e = Math.exp(z[o + k] - max);
                delta[o + k] = (float) e;
                s += e;
            }
            sum += z[o + y] - max - Math.log(s);
            double inv = 1 / s;
            for (int k = 0; k < c; k++) {
                delta[o + k] = (float) (scale * ((k == y ? 1 : 0) - delta[o + k] * inv));
            }
        }
        return sum;
    }

    private void backward(float[] theta, int n, float[] grad) {
        float[] d = delta;
        float[] dPrev = deltaPrev;
        for (int l = arch.layers() - 1; l >= 0; l--) {
            int in = arch.fanIn(l);
            int out = arch.fanOut(l);
            // dW_l += A_{l-1}^T delta_l
            Blas.gemm(true, false, in, out, n, 1f, acts[l], 0, in, d, 0, out, 1f, grad, layout.weightOffset(l), out);
            // db_l += column sums of delta_l
            int b0 = layout.biasOffset(l);
            for (int i = 0; i < n; i++) {
                int o = i * out;
                for (int j = 0; j < out; j++) {
                    grad[b0 + j] += d[o + j];
                }
            }
            if (l > 0) {
                // delta_{l-1} = (delta_l W_l^T) * f'(Z_{l-1})
                Blas.gemm(false, true, n, in, out, 1f, d, 0, out, theta, layout.weightOffset(l), out, 0f, dPrev, 0, in);
                arch.activation().backward(acts[l], dPrev, n * in);
                float[] t = d;
                d = dPrev;
                dPrev = t;
            }
        }
    }

    static void softmax(float[] z, int off, int c, float[] out, int outOff) {
        double max = Double.NEGATIVE_INFINITY;
        for (int k = 0; k < c; k++) {
            max = Math.max(max, z[off + k]);
        }
        double s = 0;
        for (int k = 0; k < c; k++) {
            s += Math.exp(z[off + k] - max);
        }
        for (int k = 0; k < c; k++) {
            out[outOff + k] = (float) (Math.exp(z[off + k] - max) / s);
        }
    }
}
