package dev.dowser.data;

import dev.dowser.blas.Blas;
import java.util.Arrays;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.EigenDecomposition_F64;

/**
 * Principal components (Pearson 1901; Jolliffe 2002, "Principal Component Analysis", ch. 1): the
 * eigenvectors of the features' covariance matrix with the largest eigenvalues. Fitted on a pool
 * (no labels needed), it projects records onto its first k components, so that a wide pool (784
 * pixels) becomes a narrow one the network and the scorer handle quickly. Whitened, each
 * projected component is scaled to unit variance; otherwise the components are orthonormal and
 * the projection keeps the inputs' distances within their span. The covariance is one product on
 * BLAS; the eigenvectors come from EJML.
 *
 * @param mean       the features' means
 * @param components k components of the inputs' width, row-major, each divided by its standard
 *                   deviation when whitened, of unit length otherwise
 */
public record Pca(float[] mean, float[] components, int inputs, int k) {

    /** The first {@code k} components of {@code rows} rows of x, whitened. */
    public static Pca fit(float[] x, int rows, int cols, int k) {
        return fit(x, rows, cols, k, true);
    }

    /** The first {@code k} components of {@code rows} rows of x, each scaled to unit variance if {@code whiten}. */
    public static Pca fit(float[] x, int rows, int cols, int k, boolean whiten) {
        if (k < 1 || k > cols) {
            throw new IllegalArgumentException("principal components must number 1 to " + cols + ", got " + k);
        }
        double[] mean = new double[cols];
        for (int i = 0; i < rows; i++) {
            for (int j = 0; j < cols; j++) {
                mean[j] += x[i * cols + j];
            }
        }
        for (int j = 0; j < cols; j++) {
            mean[j] /= rows;
        }
        float[] centred = new float[rows * cols];
        for (int i = 0; i < rows; i++) {
            for (int j = 0; j < cols; j++) {
                centred[i * cols + j] = (float) (x[i * cols + j] - mean[j]);
            }
        }
        // C = X^T X / (n - 1), one product.
        float[] cov = new float[cols * cols];
        Blas.gemm(true, false, cols, cols, rows, 1f / (rows - 1), centred, 0, cols, centred, 0, cols, 0f, cov, 0, cols);
        DMatrixRMaj c = new DMatrixRMaj(cols, cols);
        for (int i = 0; i < cols * cols; i++) {
            c.data[i] = cov[i];
        }
        EigenDecomposition_F64<DMatrixRMaj> eig = DecompositionFactory_DDRM.eig(cols, true, true);
        if (!eig.decompose(c)) {
            throw new IllegalStateException("the covariance's eigendecomposition did not converge");
        }
        Integer[] order = new Integer[cols];
        double[] values = new double[cols];
        for (int i = 0; i < cols; i++) {
            order[i] = i;
            values[i] = eig.getEigenvalue(i).getReal();
        }
        Arrays.sort(order, (a, b) -> Double.compare(values[b], values[a]));
        float[] components = new float[k * cols];
        for (int p = 0; p < k; p++) {
            DMatrixRMaj v = eig.getEigenVector(order[p]);
            double sd = whiten ? Math.sqrt(Math.max(values[order[p]], 1e-12)) : 1;
            for (int j = 0; j < cols; j++) {
                components[p * cols + j] = (float) (v.get(j, 0) / sd);
            }
        }
        float[] m = new float[cols];
        for (int j = 0; j < cols; j++) {
            m[j] = (float) mean[j];
        }
        return new Pca(m, components, cols, k);
    }

    /** {@code rows} rows of x projected: (x - mean) V, k values per row. */
    public float[] project(float[] x, int rows) {
        float[] centred = new float[rows * inputs];
        for (int i = 0; i < rows; i++) {
            for (int j = 0; j < inputs; j++) {
                centred[i * inputs + j] = x[i * inputs + j] - mean[j];
            }
        }
        float[] out = new float[rows * k];
        Blas.gemm(false, true, rows, k, inputs, 1f, centred, 0, inputs, components, 0, inputs, 0f, out, 0, k);
        return out;
    }

    /** A labelled set with its features projected. */
    public LabelledSet project(LabelledSet set) {
        return new LabelledSet(project(set.x(), set.rows()), set.labels(), set.poolRows(), k, set.classes());
    }
}
