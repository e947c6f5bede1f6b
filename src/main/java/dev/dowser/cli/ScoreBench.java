package dev.dowser.cli;

import dev.dowser.acquire.PoolScorer;
import dev.dowser.blas.Blas;
import dev.dowser.model.Activation;
import dev.dowser.model.Architecture;
import dev.dowser.model.Layout;
import java.io.PrintWriter;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

/** The scoring kernel's benchmarks and the machine's sgemm throughput, run by {@code dowser bench}. */
final class ScoreBench {

    /** A pool shape: rows, features, hidden units, classes, draws. */
    record Shape(String name, int rows, int inputs, int hidden, int classes, int draws) {

        double flops() {
            return 2.0 * rows * draws * ((double) inputs * hidden + (double) hidden * classes);
        }
    }

    static final List<Shape> FULL = List.of(
            new Shape("a", 100_000, 64, 128, 10, 64),
            new Shape("b", 1_000_000, 64, 128, 10, 32),
            new Shape("c", 100_000, 784, 256, 10, 32));
    static final List<Shape> QUICK = List.of(new Shape("a", 20_000, 64, 128, 10, 64));

    private ScoreBench() {
    }

    /**
     * The machine's sgemm throughput: every core running its own n x n product at once through
     * the model's (single-threaded) BLAS, as the scorer runs; best of three, in GFLOP/s.
     */
    static double machineSgemmGflops(int n) {
        int cores = Runtime.getRuntime().availableProcessors();
        ExecutorService pool = Executors.newFixedThreadPool(cores);
        try {
            double best = 0;
            for (int rep = 0; rep < 4; rep++) {
                List<Future<?>> fs = new ArrayList<>();
                long t0 = System.nanoTime();
                for (int c = 0; c < cores; c++) {
                    fs.add(pool.submit(() -> {
                        float[] a = filled(n * n, 1);
                        float[] b = filled(n * n, 2);
                        Blas.matmul(n, n, n, a, b, new float[n * n]);
                    }));
                }
                for (Future<?> f : fs) {
                    f.get();
                }
                double s = (System.nanoTime() - t0) / 1e9;
                if (rep > 0) {
                    best = Math.max(best, cores * 2.0 * n * n * n / s / 1e9);
                }
            }
            return best;
        } catch (Exception e) {
            throw new IllegalStateException(e);
        } finally {
            pool.shutdownNow();
        }
    }

    static float[] filled(int size, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        float[] v = new float[size];
        for (int i = 0; i < size; i++) {
            v[i] = (float) rng.nextGaussian();
        }
        return v;
    }

    static void run(PrintWriter out, double machineGflops, boolean quick) {
        try (PoolScorer scorer = PoolScorer.withAllCores()) {
            for (Shape sh : quick ? QUICK : FULL) {
                Layout layout = new Layout(new Architecture(sh.inputs(), List.of(sh.hidden()), sh.classes(),
                        Activation.RELU));
                float[] x = filled(sh.rows() * sh.inputs(), 3);
                List<float[]> draws = new ArrayList<>();
                for (int k = 0; k < sh.draws(); k++) {
                    float[] theta = filled(layout.dimension(), 10 + k);
                    for (int i = 0; i < theta.length; i++) {
                        theta[i] *= 0.1f;
                    }
                    draws.add(theta);
                }
                scorer.score(layout, draws, x, Math.min(sh.rows(), 10_000));
                double best = Double.MAX_VALUE;
                for (int rep = 0; rep < 2; rep++) {
                    long t0 = System.nanoTime();
                    scorer.score(layout, draws, x, sh.rows());
                    best = Math.min(best, (System.nanoTime() - t0) / 1e9);
                }
                double gflops = sh.flops() / best / 1e9;
                out.printf("score_%s_seconds=%.3f%nscore_%s_rows_per_s=%.0f%nscore_%s_gflops=%.1f%n"
                                + "score_%s_fraction_of_sgemm=%.3f%n", sh.name(), best, sh.name(), sh.rows() / best,
                        sh.name(), gflops, sh.name(), gflops / machineGflops);
                out.flush();
            }
        }
    }
}
