package dev.dowser.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.function.Function;
import org.junit.jupiter.api.Test;

/**
 * The two-parameter Gaussian mixture of Welling & Teh (2011, section 5.1): theta1 ~ N(0, 10),
 * theta2 ~ N(0, 1), x_i ~ 1/2 N(theta1, 2) + 1/2 N(theta1 + theta2, 2), 100 points drawn with
 * theta1 = 0, theta2 = 1. The likelihood is unchanged by (theta1, theta2) -> (theta1 + theta2,
 * -theta2), so the posterior has two modes; every kernel, and the cyclical schedule, must visit
 * both, where a grid evaluation of the same posterior finds them.
 */
class MixturePosteriorTest {

    static final double VAR = 2;

    record MixtureTarget(double[] x) implements Target {

        @Override
        public int dimension() {
            return 2;
        }

        @Override
        public int dataSize() {
            return x.length;
        }

        static double normal(double x, double mean) {
            return Math.exp(-(x - mean) * (x - mean) / (2 * VAR)) / Math.sqrt(2 * Math.PI * VAR);
        }

        double logPosterior(double t1, double t2, int[] rows, int n, double[] grad) {
            double scale = (double) x.length / n;
            double ll = 0;
            double g1 = 0;
            double g2 = 0;
            for (int k = 0; k < n; k++) {
                double xi = x[rows == null ? k : rows[k]];
                double a = normal(xi, t1);
                double b = normal(xi, t1 + t2);
                double mix = 0.5 * (a + b);
                ll += Math.log(mix);
                g1 += 0.5 * (a * (xi - t1) / VAR + b * (xi - t1 - t2) / VAR) / mix;
                g2 += 0.5 * b * (xi - t1 - t2) / VAR / mix;
            }
            if (grad != null) {
                grad[0] = scale * g1 - t1 / 10;
                grad[1] = scale * g2 - t2;
            }
            return scale * ll - t1 * t1 / 20 - t2 * t2 / 2;
        }

        @Override
        public double logDensity(float[] theta, double[] hyper, Batch batch, float[] grad) {
            double[] g = new double[2];
            double v = logPosterior(theta[0], theta[1], batch.rows(), batch.size(), g);
            grad[0] = (float) g[0];
            grad[1] = (float) g[1];
            return v;
        }
    }

    static MixtureTarget data() {
        SplittableRandom rng = new SplittableRandom(100);
        double[] x = new double[100];
        for (int i = 0; i < x.length; i++) {
            double mean = rng.nextBoolean() ? 0 : 1;
            x[i] = mean + Math.sqrt(VAR) * rng.nextGaussian();
        }
        return new MixtureTarget(x);
    }

    /**
     * Local maxima of the posterior on a grid: points higher than every other point within
     * {@value #RADIUS} grid steps, and within 5 nats of the highest. The radius keeps a flat
     * diagonal ridge, which a grid samples as a row of tiny bumps, from counting as many modes.
     */
    static final int RADIUS = 10;

    static List<double[]> gridModes(MixtureTarget t) {
        double step = 0.02;
        int n1 = 301;
        int n2 = 401;
        double[][] v = new double[n1][n2];
        double best = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < n1; i++) {
            for (int j = 0; j < n2; j++) {
                v[i][j] = t.logPosterior(-2 + i * step, -4 + j * step, null, t.x().length, null);
                best = Math.max(best, v[i][j]);
            }
        }
        List<double[]> modes = new ArrayList<>();
        for (int i = RADIUS; i < n1 - RADIUS; i++) {
            for (int j = RADIUS; j < n2 - RADIUS; j++) {
                boolean peak = v[i][j] > best - 5;
                for (int di = -RADIUS; di <= RADIUS && peak; di++) {
                    for (int dj = -RADIUS; dj <= RADIUS && peak; dj++) {
                        peak = (di == 0 && dj == 0) || v[i][j] > v[i + di][j + dj];
                    }
                }
                if (peak) {
                    modes.add(new double[] {-2 + i * step, -4 + j * step});
                }
            }
        }
        return modes;
    }

    @Test
    void theGridFindsTwoMirroredModes() {
        List<double[]> modes = gridModes(data());
        assertEquals(2, modes.size(), "the grid should find the two symmetric modes");
        // The second is the first under (theta1, theta2) -> (theta1 + theta2, -theta2), to grid accuracy.
        double[] a = modes.get(0);
        double[] b = modes.get(1);
        boolean mirrored = Math.hypot(a[0] + a[1] - b[0], -a[1] - b[1]) < 0.1
                || Math.hypot(b[0] + b[1] - a[0], -b[1] - a[1]) < 0.1;
        assertTrue(mirrored, "modes " + java.util.Arrays.toString(a) + " and " + java.util.Arrays.toString(b));
    }

    @Test
    void sgldVisitsBothModes() {
        visitsBothModes("sgld", t -> new Sgld(t, 1.0), 0.01, 10, StepSchedule.CONSTANT);
    }

    @Test
    void preconditionedSgldVisitsBothModes() {
        visitsBothModes("psgld", t -> new PreconditionedSgld(t, 1.0), 0.01, 10, StepSchedule.CONSTANT);
    }

    @Test
    void malaVisitsBothModes() {
        visitsBothModes("mala", t -> new Mala(t, 1.0), 0.01, 100, StepSchedule.CONSTANT);
    }

    @Test
    void sghmcVisitsBothModes() {
        visitsBothModes("sghmc", t -> new Sghmc(t, 1.0), 0.01, 10, StepSchedule.CONSTANT);
    }

    @Test
    void theCyclicalScheduleVisitsBothModes() {
        visitsBothModes("sgld, cyclical", t -> new Sgld(t, 1.0), 0.02, 10, StepSchedule.cyclical(5_000));
    }

    /** At least a tenth of the draws lie nearer each of the grid's modes. */
    private static void visitsBothModes(String name, Function<Target, Kernel<?>> kernel, double step, int batch,
                                        StepSchedule schedule) {
        MixtureTarget target = data();
        List<double[]> modes = gridModes(target);
        int chains = 4;
        ChainConfig config = new ChainConfig(1_000, 5_000, 10, batch, schedule, false, 10);
        SplittableRandom master = new SplittableRandom(2011);
        List<ChainSet.Job<?>> jobs = new ArrayList<>();
        for (int c = 0; c < chains; c++) {
            float[] start = {(float) (master.nextGaussian()), (float) (master.nextGaussian())};
            jobs.add(ChainSet.job(c, kernel.apply(target), target, master.split(), start, null, step,
                    Batch.full(Math.min(batch, 100)), null));
        }
        List<ChainRun> runs;
        try (ChainSet set = new ChainSet(2)) {
            runs = set.run(jobs, config);
        }
        int[] near = new int[2];
        int total = 0;
        for (ChainRun r : runs) {
            for (float[] d : r.draws()) {
                total++;
                double d0 = Math.hypot(d[0] - modes.get(0)[0], d[1] - modes.get(0)[1]);
                double d1 = Math.hypot(d[0] - modes.get(1)[0], d[1] - modes.get(1)[1]);
                near[d0 < d1 ? 0 : 1]++;
            }
        }
        assertTrue(near[0] > 0.1 * total && near[1] > 0.1 * total,
                name + ": draws near each mode: " + near[0] + " and " + near[1] + " of " + total);
    }
}
