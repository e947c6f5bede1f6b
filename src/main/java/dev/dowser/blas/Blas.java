package dev.dowser.blas;

import dev.ludovic.netlib.blas.BLAS;

/**
 * The one door to BLAS, row-major. Behind it {@code dev.ludovic.netlib} calls the system's BLAS
 * through JNI when one is installed (Debian's {@code libopenblas0-pthread}: about 100 GFLOP/s
 * for sgemm on this machine) and pure Java otherwise (about 3). BLAS itself runs on one thread
 * (the launcher sets {@code OPENBLAS_NUM_THREADS=1}); Dowser puts its parallelism in Java.
 */
public final class Blas {

    private static final BLAS BLAS_IMPL = BLAS.getInstance();

    private Blas() {
    }

    /** Which implementation is in use, for reports: {@code JNIBLAS}, {@code VectorBLAS} or {@code Java11BLAS}. */
    public static String implementation() {
        return BLAS_IMPL.getClass().getSimpleName();
    }

    /**
     * C = alpha * op(A) * op(B) + beta * C for row-major matrices: op(A) is m x k, op(B) is k x n,
     * C is m x n. A row-major product is the column-major product of the transposes,
     * C^T = op(B)^T op(A)^T, which is how it is handed to Fortran-order BLAS.
     */
    public static void gemm(boolean transA, boolean transB, int m, int n, int k, float alpha,
                            float[] a, int aOff, int lda, float[] b, int bOff, int ldb,
                            float beta, float[] c, int cOff, int ldc) {
        BLAS_IMPL.sgemm(transB ? "T" : "N", transA ? "T" : "N", n, m, k, alpha, b, bOff, ldb, a, aOff, lda,
                beta, c, cOff, ldc);
    }

    /** C = A B, all row-major and dense: A is m x k, B is k x n. */
    public static void matmul(int m, int n, int k, float[] a, float[] b, float[] c) {
        gemm(false, false, m, n, k, 1f, a, 0, k, b, 0, n, 0f, c, 0, n);
    }
}
