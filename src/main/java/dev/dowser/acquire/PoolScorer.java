package dev.dowser.acquire;

import dev.dowser.blas.Blas;
import dev.dowser.model.Activation;
import dev.dowser.model.Architecture;
import dev.dowser.model.Layout;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

/**
 * Scores every record of a pool from S posterior draws in one fused pass. Rows go in blocks; for
 * each block, the first layer of all draws is one matrix product (the draws' first-layer weights
 * stacked side by side, d x S*h), then each draw's remaining layers, the output layer transposed
 * (classes x rows), and then the softmax and the entropy (H = logsumexp(z) - sum p z) are
 * folded into running sums in double, in loops along rows that the JIT vectorises (the
 * per-element Math.exp they replace took a third of the time on shape (a) of the bench). Nothing
 * of size N x S x C is ever held: memory is the draws plus one block per thread.
 * Blocks are spread over threads; BLAS itself stays single-threaded.
 */
public final class PoolScorer implements AutoCloseable {

    public static final int DEFAULT_BLOCK_ROWS = 128;
    /**
     * Draws whose first layers are stacked into one product. Bounding it bounds a thread's buffer
     * (block rows x group x hidden) whatever the number of draws: beyond the draws themselves,
     * memory does not grow with S.
     */
    public static final int GROUP_DRAWS = 32;

    /** The first layers of draws first..first+count, stacked side by side, biases in the last row. */
    private record Group(int first, int count, float[] w1) {
    }

    /**
     * Per record: BALD, the predictive entropy, and the margin (1 minus the gap between the two
     * largest mean class probabilities, so that larger means less sure, as for the others).
     */
    public record Result(double[] bald, double[] entropy, double[] margin) {
    }

    private final ExecutorService pool;
    private final int threads;
    private final int blockRows;

    public PoolScorer(int threads, int blockRows) {
        if (threads < 1 || blockRows < 1) {
            throw new IllegalArgumentException("threads and blockRows must be at least 1");
        }
        this.threads = threads;
        this.blockRows = blockRows;
        this.pool = Executors.newFixedThreadPool(threads, r -> {
            Thread t = new Thread(r, "dowser-score");
            t.setDaemon(true);
            return t;
        });
    }

    public static PoolScorer withAllCores() {
        return new PoolScorer(Runtime.getRuntime().availableProcessors(), DEFAULT_BLOCK_ROWS);
    }

    /** The threads it scores on: also the round's budget for its chains ({@code RoundStep}). */
    public int threads() {
        return threads;
    }

    /** Scores rows {@code 0..rows} of x (row-major, the network's inputs per row). */
    public Result score(Layout layout, List<float[]> draws, float[] x, int rows) {
        Architecture a = layout.architecture();
        int classes = a.classes();
        int s = draws.size();
        int h1 = a.fanOut(0);
        int d = a.inputs();
        // The first layer of every draw side by side: row i holds W1[i][*] of draw 0, then of draw 1...
        List<Group> groups = new ArrayList<>();
        for (int first = 0; first < s; first += GROUP_DRAWS) {
            int count = Math.min(GROUP_DRAWS, s - first);
            // d + 1 rows: the weights, then the biases, which meet a column of ones appended to X.
            float[] w1 = new float[(d + 1) * count * h1];
            for (int k = 0; k < count; k++) {
                float[] theta = draws.get(first + k);
                for (int i = 0; i < d; i++) {
                    System.arraycopy(theta, layout.weightOffset(0) + i * h1, w1, i * count * h1 + k * h1, h1);
                }
                System.arraycopy(theta, layout.biasOffset(0), w1, d * count * h1 + k * h1, h1);
            }
            groups.add(new Group(first, count, w1));
        }
        Result out = new Result(new double[rows], new double[rows], new double[rows]);
        int blocks = (rows + blockRows - 1) / blockRows;
        List<Future<?>> futures = new ArrayList<>();
        for (int t = 0; t < threads; t++) {
            int first = t;
            futures.add(pool.submit(() -> {
                Block work = new Block(layout, draws, groups, blockRows);
                for (int b = first; b < blocks; b += threads) {
                    int start = b * blockRows;
                    work.score(x, start, Math.min(blockRows, rows - start), out);
                }
            }));
        }
        try {
            for (Future<?> f : futures) {
                f.get();
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted while scoring", e);
        } catch (ExecutionException e) {
            throw new IllegalStateException("scoring failed: " + e.getCause(), e.getCause());
        }
        return out;
    }

    /** One thread's work buffers and the fused per-block computation. */
    private static final class Block {

        private final Layout layout;
        private final Architecture arch;
        private final List<float[]> draws;
        private final List<Group> groups;
        private final int s;
        private final int h1;
        private final int classes;
        private final float[] hidden;
        private final float[][] deeper;
        private final float[] logitsT;
        private final float[] rowMax;
        private final double[] rowSum;
        private final float[] xOnes;
        private final double[] meanP;
        private final double[] meanH;
        private final double[] shifted;
        private final double[] expU;
        private final double[] sumProduct;

        Block(Layout layout, List<float[]> draws, List<Group> groups, int blockRows) {
            this.layout = layout;
            this.arch = layout.architecture();
            this.draws = draws;
            this.groups = groups;
            this.s = draws.size();
            this.h1 = arch.fanOut(0);
            this.classes = arch.classes();
            this.hidden = new float[blockRows * Math.min(s, GROUP_DRAWS) * h1];
            int layers = arch.layers();
            this.deeper = new float[Math.max(0, layers - 2)][];
            for (int l = 1; l < layers - 1; l++) {
                deeper[l - 1] = new float[blockRows * arch.fanOut(l)];
            }
            this.logitsT = new float[blockRows * classes];
            this.rowMax = new float[blockRows];
            this.rowSum = new double[blockRows];
            this.xOnes = new float[blockRows * (arch.inputs() + 1)];
            this.meanP = new double[blockRows * classes];
            this.meanH = new double[blockRows];
            this.shifted = new double[blockRows * classes];
            this.expU = new double[blockRows * classes];
            this.sumProduct = new double[blockRows];
        }

        void score(float[] x, int start, int n, Result out) {
            int d = arch.inputs();
            for (int r = 0; r < n; r++) {
                System.arraycopy(x, (start + r) * d, xOnes, r * (d + 1), d);
                xOnes[r * (d + 1) + d] = 1f;
            }
            int layers = arch.layers();
            java.util.Arrays.fill(meanP, 0, n * classes, 0);
            java.util.Arrays.fill(meanH, 0, n, 0);
            java.util.Arrays.fill(sumProduct, 0, n, 1);
            for (Group g : groups) {
                int width = g.count() * h1;
                // First layer of the group's draws at once: hidden = [X 1] [W1; b1], then f. The bias
                // rides in the product (beta = 0), sparing a pass over the block's largest buffer.
                Blas.gemm(false, false, n, width, d + 1, 1f, xOnes, 0, d + 1, g.w1(), 0, width, 0f, hidden, 0, width);
                if (layers > 1) {
                    activate(hidden, n * width);
                }
                for (int k = 0; k < g.count(); k++) {
                    float[] theta = draws.get(g.first() + k);
                    if (layers == 1) {
                        transposeLogits(hidden, k * classes, width, n);
                    } else {
                        forwardDeeper(theta, k * h1, width, n);
                    }
                    accumulate(n);
                }
                flushLogs(n);
            }
            for (int r = 0; r < n; r++) {
                int row = start + r;
                double h = 0;
                double first = 0;
                double second = 0;
                for (int c = 0; c < classes; c++) {
                    double p = meanP[c * n + r] / s;
                    if (p > 0) {
                        h -= p * Math.log(p);
                    }
                    if (p > first) {
                        second = first;
                        first = p;
                    } else if (p > second) {
                        second = p;
                    }
                }
                out.entropy()[row] = h;
                out.bald()[row] = Math.max(0, h - meanH[r] / s);
                // Margin sampling (Scheffer, Decomain & Wrobel 2001) on the posterior predictive.
                out.margin()[row] = 1 - (first - second);
            }
        }

        private void activate(float[] z, int count) {
            if (arch.activation() == Activation.RELU) {
                for (int i = 0; i < count; i++) {
                    z[i] = Math.max(z[i], 0f);
                }
            } else {
                for (int i = 0; i < count; i++) {
                    z[i] = (float) Math.tanh(z[i]);
                }
            }
        }

        /**
         * The layers after the first for one draw, whose first-layer output sits at column
         * {@code inOff} of the hidden buffer. The output layer is computed transposed, logits^T =
         * W^T h^T (classes x rows), so that {@link #accumulate} runs along rows, in vector lanes.
         */
        private void forwardDeeper(float[] theta, int inOff, int lda, int n) {
            int layers = arch.layers();
            float[] in = hidden;
            for (int l = 1; l < layers - 1; l++) {
                int fanIn = arch.fanIn(l);
                int fanOut = arch.fanOut(l);
                float[] outBuf = deeper[l - 1];
                for (int r = 0; r < n; r++) {
                    System.arraycopy(theta, layout.biasOffset(l), outBuf, r * fanOut, fanOut);
                }
                Blas.gemm(false, false, n, fanOut, fanIn, 1f, in, inOff, lda, theta, layout.weightOffset(l),
                        fanOut, 1f, outBuf, 0, fanOut);
                activate(outBuf, n * fanOut);
                in = outBuf;
                inOff = 0;
                lda = fanOut;
            }
            int last = layers - 1;
            int bias = layout.biasOffset(last);
            for (int c = 0; c < classes; c++) {
                java.util.Arrays.fill(logitsT, c * n, (c + 1) * n, theta[bias + c]);
            }
            Blas.gemm(true, true, classes, n, arch.fanIn(last), 1f, theta, layout.weightOffset(last), classes,
                    in, inOff, lda, 1f, logitsT, 0, n);
        }

        /** Without hidden layers the group product already holds the logits; lay them out by class. */
        private void transposeLogits(float[] z, int colOff, int ld, int n) {
            for (int r = 0; r < n; r++) {
                for (int c = 0; c < classes; c++) {
                    logitsT[c * n + r] = z[r * ld + colOff + c];
                }
            }
        }

        /**
         * Folds one draw's logits (by class, z[c][r]) into the running sums. With m the row's largest
         * logit and u = z - m: p = exp(u) / sum, H = log(sum) - sum_c p u. Every loop runs along
         * rows, so the JIT vectorises it, the exponentials included ({@link FastExp}); the log of each row's sum waits in a product
         * until the group ends ({@link #flushLogs}).
         */
        private void accumulate(int n) {
            System.arraycopy(logitsT, 0, rowMax, 0, n);
            for (int c = 1; c < classes; c++) {
                int o = c * n;
                for (int r = 0; r < n; r++) {
                    rowMax[r] = Math.max(rowMax[r], logitsT[o + r]);
                }
            }
            for (int c = 0; c < classes; c++) {
                int o = c * n;
                for (int r = 0; r < n; r++) {
                    shifted[o + r] = logitsT[o + r] - rowMax[r];
                }
            }
            FastExp.exp(shifted, expU, n * classes);
            java.util.Arrays.fill(rowSum, 0, n, 0);
            for (int c = 0; c < classes; c++) {
                int o = c * n;
                for (int r = 0; r < n; r++) {
                    rowSum[r] += expU[o + r];
                }
            }
            for (int r = 0; r < n; r++) {
                rowSum[r] = 1 / rowSum[r];
            }
            for (int c = 0; c < classes; c++) {
                int o = c * n;
                for (int r = 0; r < n; r++) {
                    double p = expU[o + r] * rowSum[r];
                    meanP[o + r] += p;
                    meanH[r] -= p * shifted[o + r];
                }
            }
            for (int r = 0; r < n; r++) {
                sumProduct[r] /= rowSum[r];
            }
        }

        /**
         * Adds the logs of the row sums held in the product: one log per row and group instead of
         * one per row and draw. Each sum lies in [1, C], so a group's product stays below C^32.
         */
        private void flushLogs(int n) {
            for (int r = 0; r < n; r++) {
                meanH[r] += Math.log(sumProduct[r]);
                sumProduct[r] = 1;
            }
        }
    }

    @Override
    public void close() {
        pool.shutdownNow();
    }
}
