package dev.dowser.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresOptimizer;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.DiagonalMatrix;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.util.Pair;
import org.junit.jupiter.api.Test;

/**
 * The inverse power law fit (Figueroa et al. 2012) against Apache Commons Math 3.6.1's
 * Levenberg-Marquardt solver on synthetic curves with known parameters.
 */
class LearningCurveTest {

    /** A synthetic learning curve: a = 0.95, b = 0.8, c = 0.6, measured every 10 labels from 20 to 400. */
    private static final double A = 0.95;
    private static final double B = 0.8;
    private static final double C = 0.6;

    private record Data(double[] n, double[] y, double[] w) {
    }

    /** Each point's noise has variance 0.09 / w, as an accuracy near 0.9 measured on w labels would. */
    private static Data synthetic(SplittableRandom rng) {
        int k = 39;
        double[] n = new double[k];
        double[] y = new double[k];
        double[] w = new double[k];
        for (int i = 0; i < k; i++) {
            n[i] = 20 + 10 * i;
            w[i] = 40 + (i % 3) * 40;
            y[i] = A - B * Math.pow(n[i], -C) + Math.sqrt(0.09 / w[i]) * rng.nextGaussian();
        }
        return new Data(n, y, w);
    }

    private static LeastSquaresOptimizer.Optimum reference(Data d, double[] start) {
        LeastSquaresBuilder builder = new LeastSquaresBuilder()
                .model(theta -> {
                    double a = theta.getEntry(0);
                    double b = theta.getEntry(1);
                    double c = theta.getEntry(2);
                    double[] value = new double[d.n().length];
                    RealMatrix jacobian = new Array2DRowRealMatrix(d.n().length, 3);
                    for (int i = 0; i < d.n().length; i++) {
                        double p = Math.pow(d.n()[i], -c);
                        value[i] = a - b * p;
                        jacobian.setRow(i, new double[] {1, -p, b * p * Math.log(d.n()[i])});
                    }
                    return new Pair<>(new ArrayRealVector(value), jacobian);
                })
                .target(d.y()).weight(new DiagonalMatrix(d.w())).start(start)
                .maxEvaluations(10_000).maxIterations(10_000);
        return new LevenbergMarquardtOptimizer().optimize(builder.build());
    }

    @Test
    void agreesWithLevenbergMarquardt() {
        SplittableRandom rng = new SplittableRandom(21);
        for (int trial = 0; trial < 5; trial++) {
            Data d = synthetic(rng);
            LearningCurve fit = LearningCurve.fit(d.n(), d.y(), d.w());
            LeastSquaresOptimizer.Optimum lm = reference(d, new double[] {0.9, 1, 0.5});
            double[] theta = lm.getPoint().toArray();
            // b and c trade off along a narrow valley, so they agree to a relative 1e-4 and the
            // weighted residual sums to 1e-9: the same minimum.
            assertEquals(theta[0], fit.a(), 1e-5, "a, trial " + trial);
            assertEquals(theta[1], fit.b(), 1e-4 * Math.abs(theta[1]), "b, trial " + trial);
            assertEquals(theta[2], fit.c(), 1e-4 * theta[2], "c, trial " + trial);
            double lmRss = lm.getCost() * lm.getCost();
            // Commons Math's covariance is (J'WJ)^-1; ours is scaled by the residual variance.
            RealMatrix cov = lm.getCovariances(1e-14);
            double rss = 0;
            for (int i = 0; i < d.n().length; i++) {
                double r = d.y()[i] - fit.at(d.n()[i]);
                rss += d.w()[i] * r * r;
            }
            assertEquals(lmRss, rss, 1e-9 * lmRss, "weighted residual sum, trial " + trial);
            double s2 = rss / (d.n().length - 3);
            for (int i = 0; i < 3; i++) {
                for (int j = 0; j < 3; j++) {
                    double expected = s2 * cov.getEntry(i, j);
                    assertEquals(expected, fit.covariance()[i * 3 + j], 1e-3 * Math.abs(expected) + 1e-12,
                            "covariance " + i + "," + j);
                }
            }
            // And the known parameters are recovered within a few of their standard errors.
            assertEquals(A, fit.a(), 4 * Math.sqrt(fit.covariance()[0]), "a near the truth");
            assertEquals(C, fit.c(), 4 * Math.sqrt(fit.covariance()[8]), "c near the truth");
        }
    }

    @Test
    void projectionsCoverTheTrueCurve() {
        // The 95% intervals at +100, +500 and +1,000 labels past the last point cover the true
        // curve in at least 90% of 300 synthetic data sets (the delta method is approximate).
        SplittableRandom rng = new SplittableRandom(22);
        int trials = 300;
        int[] covered = new int[3];
        double[] more = {100, 500, 1000};
        for (int t = 0; t < trials; t++) {
            Data d = synthetic(rng);
            LearningCurve fit = LearningCurve.fit(d.n(), d.y(), d.w());
            for (int k = 0; k < 3; k++) {
                double at = 400 + more[k];
                LearningCurve.Projection p = fit.project(at);
                double truth = A - B * Math.pow(at, -C);
                covered[k] += truth >= p.lower() && truth <= p.upper() ? 1 : 0;
            }
        }
        for (int k = 0; k < 3; k++) {
            assertTrue(covered[k] >= 0.9 * trials, "+" + more[k] + ": covered " + covered[k] + " of " + trials);
        }
    }

    @Test
    void anExactCurveIsRecoveredExactly() {
        double[] n = {10, 20, 40, 80, 160, 320};
        double[] y = new double[n.length];
        double[] w = new double[n.length];
        for (int i = 0; i < n.length; i++) {
            y[i] = 0.9 - 0.5 * Math.pow(n[i], -0.7);
            w[i] = 1;
        }
        LearningCurve fit = LearningCurve.fit(n, y, w);
        assertEquals(0.9, fit.a(), 1e-7);
        assertEquals(0.5, fit.b(), 1e-6);
        assertEquals(0.7, fit.c(), 1e-6);
        // The gain from 320 to 420 labels is the curve's own difference.
        assertEquals(0.5 * (Math.pow(320, -0.7) - Math.pow(420, -0.7)), fit.gain(320, 100).accuracy(), 1e-7);
    }

    @Test
    void tooFewPointsGiveNoCurve() {
        assertNull(LearningCurve.fit(new double[] {10, 20, 30, 40}, new double[] {0.5, 0.6, 0.7, 0.75},
                new double[] {1, 1, 1, 1}));
        assertNull(LearningCurve.fit(new double[] {10, 10, 20, 20, 20}, new double[] {0.5, 0.6, 0.7, 0.75, 0.7},
                new double[] {1, 1, 1, 1, 1}));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> LearningCurve.fit(
                new double[] {10, 0}, new double[] {0.5, 0.6}, new double[] {1, 1}));
        assertEquals("point 1 needs n >= 1, a finite accuracy and a positive weight; got n = 0.0, accuracy = 0.6,"
                + " weight = 1.0", e.getMessage());
    }
}
