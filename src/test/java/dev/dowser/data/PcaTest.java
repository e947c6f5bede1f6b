package dev.dowser.data;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.SplittableRandom;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.apache.commons.math3.stat.correlation.Covariance;
import org.junit.jupiter.api.Test;

/**
 * Principal components against a reference: Commons Math's covariance and symmetric eigen
 * decomposition of the same data. Each projected component has unit variance and the components
 * are uncorrelated (Jolliffe 2002, ch. 1).
 */
class PcaTest {

    @Test
    void componentsMatchCommonsMathAndWhiten() {
        SplittableRandom rng = new SplittableRandom(3);
        int n = 4_000;
        int d = 5;
        double[][] mix = {{3, 0, 0, 0, 0}, {1, 2, 0, 0, 0}, {0, 1, 1, 0, 0}, {0, 0, 0.5, 0.7, 0}, {0.2, 0, 0, 0, 0.3}};
        float[] x = new float[n * d];
        double[][] ref = new double[n][d];
        for (int i = 0; i < n; i++) {
            double[] z = new double[d];
            for (int j = 0; j < d; j++) {
                z[j] = rng.nextGaussian();
            }
            for (int j = 0; j < d; j++) {
                double v = 10 + j;
                for (int k = 0; k < d; k++) {
                    v += mix[j][k] * z[k];
                }
                x[i * d + j] = (float) v;
                ref[i][j] = (float) v;
            }
        }
        Pca pca = Pca.fit(x, n, d, 2);
        EigenDecomposition eig = new EigenDecomposition(new Covariance(new Array2DRowRealMatrix(ref))
                .getCovarianceMatrix());
        // Commons Math lists eigenvalues in descending order; a component's sign is arbitrary.
        for (int p = 0; p < 2; p++) {
            double[] v = eig.getEigenvector(p).toArray();
            double sd = Math.sqrt(eig.getRealEigenvalue(p));
            double sign = Math.signum(v[0]) * Math.signum(pca.components()[p * d]);
            for (int j = 0; j < d; j++) {
                assertEquals(v[j] / sd, sign * pca.components()[p * d + j], 1e-4, "component " + p + ", input " + j);
            }
        }
        float[] y = pca.project(x, n);
        double[] sum = new double[2];
        double[] sq = new double[2];
        double cross = 0;
        for (int i = 0; i < n; i++) {
            for (int p = 0; p < 2; p++) {
                sum[p] += y[i * 2 + p];
                sq[p] += y[i * 2 + p] * y[i * 2 + p];
            }
            cross += y[i * 2] * y[i * 2 + 1];
        }
        for (int p = 0; p < 2; p++) {
            assertEquals(0, sum[p] / n, 1e-3, "centred");
            assertEquals(1, sq[p] / (n - 1), 1e-3, "unit variance");
        }
        assertEquals(0, cross / (n - 1), 1e-3, "uncorrelated");
    }

    /** Without whitening the components are Commons Math's unit eigenvectors and each projection's variance is its eigenvalue. */
    @Test
    void unwhitenedComponentsKeepTheScale() {
        SplittableRandom rng = new SplittableRandom(5);
        int n = 4_000;
        int d = 3;
        float[] x = new float[n * d];
        double[][] ref = new double[n][d];
        for (int i = 0; i < n; i++) {
            double a = 4 * rng.nextGaussian();
            double b = rng.nextGaussian();
            double[] v = {a + b, a - b, 0.1 * rng.nextGaussian() + 2};
            for (int j = 0; j < d; j++) {
                x[i * d + j] = (float) v[j];
                ref[i][j] = (float) v[j];
            }
        }
        Pca pca = Pca.fit(x, n, d, 2, false);
        EigenDecomposition eig = new EigenDecomposition(new Covariance(new Array2DRowRealMatrix(ref))
                .getCovarianceMatrix());
        float[] y = pca.project(x, n);
        for (int p = 0; p < 2; p++) {
            double[] v = eig.getEigenvector(p).toArray();
            double sign = Math.signum(v[0]) * Math.signum(pca.components()[p * d]);
            for (int j = 0; j < d; j++) {
                assertEquals(v[j], sign * pca.components()[p * d + j], 1e-4, "component " + p + ", input " + j);
            }
            double sq = 0;
            for (int i = 0; i < n; i++) {
                sq += y[i * 2 + p] * y[i * 2 + p];
            }
            assertEquals(eig.getRealEigenvalue(p), sq / (n - 1), 1e-3 * eig.getRealEigenvalue(p), "variance " + p);
        }
        // The first component's variance is about 2 * 16 = 32, the second's 2 * 1 = 2: the scale stays.
        assertEquals(32, eig.getRealEigenvalue(0), 2.5);
    }
}
