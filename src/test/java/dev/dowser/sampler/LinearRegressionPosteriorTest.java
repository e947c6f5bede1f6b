package dev.dowser.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.function.Function;
import org.ejml.simple.SimpleMatrix;
import org.junit.jupiter.api.Test;

/**
 * Each kernel, run on Bayesian linear regression, against the closed-form Gaussian posterior of
 * Bishop (2006), "Pattern Recognition and Machine Learning", eqs. 3.53-3.54:
 * S_N^-1 = alpha I + beta Phi^T Phi, m_N = beta S_N Phi^T t, with the data of his figure 3.7:
 * t = a0 + a1 x + noise, a0 = -0.3, a1 = 0.5, noise SD 0.2 (beta = 25), x ~ U(-1, 1), alpha = 2.
 */
class LinearRegressionPosteriorTest {

    static final double ALPHA = 2;
    static final double BETA = 1 / (0.2 * 0.2);
    static final int N = 20;

    /** log p(w | t) up to a constant: -alpha/2 |w|^2 - beta/2 sum (t_i - w0 - w1 x_i)^2. */
    record LinearTarget(double[] x, double[] t) implements Target {

        @Override
        public int dimension() {
            return 2;
        }

        @Override
        public int dataSize() {
            return x.length;
        }

        @Override
        public double logDensity(float[] w, double[] hyper, Batch batch, float[] grad) {
            double scale = (double) x.length / batch.size();
            double ll = 0;
            double g0 = 0;
            double g1 = 0;
            for (int k = 0; k < batch.size(); k++) {
                int i = batch.isFull() ? k : batch.rows()[k];
                double r = t[i] - w[0] - w[1] * x[i];
                ll += -0.5 * BETA * r * r;
                g0 += BETA * r;
                g1 += BETA * r * x[i];
            }
            grad[0] = (float) (scale * g0 - ALPHA * w[0]);
            grad[1] = (float) (scale * g1 - ALPHA * w[1]);
            return scale * ll - 0.5 * ALPHA * ((double) w[0] * w[0] + (double) w[1] * w[1]);
        }
    }

    static LinearTarget data() {
        SplittableRandom rng = new SplittableRandom(37);
        double[] x = new double[N];
        double[] t = new double[N];
        for (int i = 0; i < N; i++) {
            x[i] = rng.nextDouble(-1, 1);
            t[i] = -0.3 + 0.5 * x[i] + 0.2 * rng.nextGaussian();
        }
        return new LinearTarget(x, t);
    }

    /** m_N and S_N by eqs. 3.53-3.54, solved with EJML. */
    static SimpleMatrix[] exact(LinearTarget d) {
        SimpleMatrix phi = new SimpleMatrix(N, 2);
        SimpleMatrix t = new SimpleMatrix(N, 1);
        for (int i = 0; i < N; i++) {
            phi.set(i, 0, 1);
            phi.set(i, 1, d.x()[i]);
            t.set(i, 0, d.t()[i]);
        }
        SimpleMatrix precision = SimpleMatrix.identity(2).scale(ALPHA).plus(phi.transpose().mult(phi).scale(BETA));
        SimpleMatrix cov = precision.invert();
        SimpleMatrix mean = cov.mult(phi.transpose()).mult(t).scale(BETA);
        return new SimpleMatrix[] {mean, cov};
    }

    private static void check(String name, Function<Target, Kernel<?>> kernel, double step, int batch, int thin) {
        check(name, kernel, step, batch, thin, StepSchedule.CONSTANT);
    }

    private static void check(String name, Function<Target, Kernel<?>> kernel, double step, int batch, int thin,
                              StepSchedule schedule) {
        LinearTarget target = data();
        SimpleMatrix[] exact = exact(target);
        int chains = 4;
        int draws = 4_000;
        ChainConfig config = new ChainConfig(2_000, draws, thin, batch, schedule, true, 10);
        SplittableRandom master = new SplittableRandom(2006);
        List<ChainSet.Job<?>> jobs = new ArrayList<>();
        for (int c = 0; c < chains; c++) {
            jobs.add(ChainSet.job(c, kernel.apply(target), target, master.split(), new float[] {0f, 0f}, null, step,
                    Batch.full(N), null));
        }
        List<ChainRun> runs;
        try (ChainSet set = new ChainSet(2)) {
            runs = set.run(jobs, config);
        }
        double[] mean = new double[2];
        double[][] cov = new double[2][2];
        int count = 0;
        for (ChainRun r : runs) {
            for (float[] w : r.draws()) {
                mean[0] += w[0];
                mean[1] += w[1];
                count++;
            }
        }
        mean[0] /= count;
        mean[1] /= count;
        for (ChainRun r : runs) {
            for (float[] w : r.draws()) {
                for (int a = 0; a < 2; a++) {
                    for (int b = 0; b < 2; b++) {
                        cov[a][b] += (w[a] - mean[a]) * (w[b] - mean[b]) / (count - 1);
                    }
                }
            }
        }
        for (int a = 0; a < 2; a++) {
            double sd = Math.sqrt(exact[1].get(a, a));
            assertEquals(exact[0].get(a), mean[a], 0.1 * sd, name + ": mean of w" + a);
            assertEquals(exact[1].get(a, a), cov[a][a], 0.1 * exact[1].get(a, a), name + ": variance of w" + a);
        }
        // The off-diagonal, within 10% of the geometric mean of the variances.
        double scale = Math.sqrt(exact[1].get(0, 0) * exact[1].get(1, 1));
        assertEquals(exact[1].get(0, 1), cov[0][1], 0.1 * scale, name + ": covariance");
    }

    @Test
    void sgldMatchesTheExactPosterior() {
        check("sgld", t -> new Sgld(t, 1.0), 1e-4, 10, 20);
    }

    /**
     * With the default alpha = 0.99 the preconditioner's memory (about 100 steps) is as long as
     * this two-parameter chain's autocorrelation, so G follows the position and the dropped
     * Gamma term shows: variances come out 10-15% wide (measured). A longer memory, alpha = 0.9999,
     * averages G over the posterior and the draws match; in a network's high-dimensional,
     * noise-dominated gradients the default's memory is already long enough.
     */
    @Test
    void preconditionedSgldMatchesTheExactPosterior() {
        check("psgld", t -> new PreconditionedSgld(t, 1.0, 0.9999, PreconditionedSgld.DEFAULT_LAMBDA), 2e-4, 10, 20);
    }

    @Test
    void malaMatchesTheExactPosterior() {
        check("mala", t -> new Mala(t, 1.0), 1e-3, N, 5);
    }

    @Test
    void sghmcMatchesTheExactPosterior() {
        check("sghmc", t -> new Sghmc(t, 1.0), 1e-4, 10, 20);
    }

    /** The cyclical schedule keeps one draw at the end of each cycle, where the step is smallest. */
    @Test
    void theCyclicalScheduleMatchesTheExactPosterior() {
        check("sgld, cyclical", t -> new Sgld(t, 1.0), 2e-4, 10, 20, StepSchedule.cyclical(4_000));
    }
}
