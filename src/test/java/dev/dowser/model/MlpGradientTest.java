package dev.dowser.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;

import dev.dowser.sampler.Batch;
import dev.dowser.sampler.MlpPosterior;
import java.util.List;
import java.util.SplittableRandom;
import org.apache.commons.math3.distribution.TDistribution;
import org.junit.jupiter.api.Test;

/**
 * The hand-derived gradient of the log posterior against central finite differences,
 * (f(theta + h e_i) - f(theta - h e_i)) / 2h, of an independent double-precision evaluation of
 * the same log posterior, on random small networks.
 */
class MlpGradientTest {

    /** The log posterior written out with plain loops in double (the network: {@link TestSupport}): the reference. */
    static double referenceLogPosterior(Layout layout, Prior prior, double[] theta, float[] x, int[] labels) {
        Architecture a = layout.architecture();
        double logp = 0;
        double biasTau = 1 / (prior.biasScale() * prior.biasScale());
        for (int l = 0; l < a.layers(); l++) {
            double tau = prior.precision(layout, l);
            int nw = layout.weightCount(l);
            for (int i = 0; i < nw; i++) {
                double w = theta[layout.weightOffset(l) + i];
                if (prior.tailDegrees() > 0) {
                    // Student-t with scale sigma = 1 / sqrt(tau), from Commons Math's standard t density.
                    double sigma = 1 / Math.sqrt(tau);
                    logp += new TDistribution(prior.tailDegrees()).logDensity(w / sigma) - Math.log(sigma);
                } else {
                    logp += -0.5 * tau * w * w + 0.5 * Math.log(tau) - 0.5 * Math.log(2 * Math.PI);
                }
            }
            for (int j = 0; j < a.fanOut(l); j++) {
                double b = theta[layout.biasOffset(l) + j];
                logp += -0.5 * biasTau * b * b + 0.5 * Math.log(biasTau) - 0.5 * Math.log(2 * Math.PI);
            }
        }
        for (int r = 0; r < labels.length; r++) {
            logp += TestSupport.referenceLogProbabilities(layout, theta, x, r)[labels[r]];
        }
        return logp;
    }

    private void check(Architecture arch, long seed) {
        check(arch, seed, new Prior(2.0, 1.0, false, 2.0));
    }

    private void check(Architecture arch, long seed, Prior prior) {
        SplittableRandom rng = new SplittableRandom(seed);
        Layout layout = new Layout(arch);
        int rows = 13;
        float[] x = new float[rows * arch.inputs()];
        int[] labels = new int[rows];
        for (int i = 0; i < x.length; i++) {
            x[i] = (float) rng.nextGaussian();
        }
        for (int r = 0; r < rows; r++) {
            labels[r] = rng.nextInt(arch.classes());
        }
        float[] theta = new float[layout.dimension()];
        for (int i = 0; i < theta.length; i++) {
            theta[i] = (float) (0.7 * rng.nextGaussian());
        }
        // A work size smaller than the data, so chunking is exercised too.
        MlpPosterior posterior = new MlpPosterior(layout, prior, x, labels, 5);
        float[] grad = new float[theta.length];
        double value = posterior.logDensity(theta, null, Batch.full(rows), grad);

        double[] t = new double[theta.length];
        for (int i = 0; i < t.length; i++) {
            t[i] = theta[i];
        }
        double reference = referenceLogPosterior(layout, prior, t, x, labels);
        assertEquals(reference, value, 1e-5 * Math.abs(reference), "log posterior");

        double h = 1e-5;
        double errSq = 0;
        double normSq = 0;
        for (int i = 0; i < t.length; i++) {
            double keep = t[i];
            t[i] = keep + h;
            double up = referenceLogPosterior(layout, prior, t, x, labels);
            t[i] = keep - h;
            double down = referenceLogPosterior(layout, prior, t, x, labels);
            t[i] = keep;
            double fd = (up - down) / (2 * h);
            errSq += (grad[i] - fd) * (grad[i] - fd);
            normSq += fd * fd;
        }
        double relative = Math.sqrt(errSq / normSq);
        assertTrue(relative < 1e-4, arch + ": relative gradient error " + relative);
    }

    @Test
    void reluNetworksMatchFiniteDifferences() {
        check(new Architecture(5, List.of(7), 3, Activation.RELU), 1);
        check(new Architecture(4, List.of(6, 5), 4, Activation.RELU), 2);
    }

    @Test
    void tanhNetworksMatchFiniteDifferences() {
        check(new Architecture(5, List.of(7), 3, Activation.TANH), 3);
        check(new Architecture(3, List.of(4, 6, 5), 2, Activation.TANH), 4);
    }

    @Test
    void aStudentTPriorMatchesFiniteDifferences() {
        check(new Architecture(5, List.of(7), 3, Activation.RELU), 5, new Prior(2.0, 1.0, false, 2.0, 3.0));
    }

    @Test
    void layoutIsDocumented() {
        Layout l = new Layout(new Architecture(3, List.of(4), 2, Activation.RELU));
        assertEquals(0, l.weightOffset(0));
        assertEquals(12, l.biasOffset(0));
        assertEquals(16, l.weightOffset(1));
        assertEquals(24, l.biasOffset(1));
        assertEquals(26, l.dimension());
    }
}
