package dev.dowser.sampler;

import java.util.SplittableRandom;

/**
 * A posterior to sample: its log density, known up to a constant, and that density's gradient,
 * on the whole data set or estimated from a mini-batch. Kernels know nothing else of the model.
 * An instance may keep work buffers: each chain uses its own.
 */
public interface Target {

    /** Length of the parameter vector. */
    int dimension();

    /** Rows of data, N. */
    int dataSize();

    /**
     * log p(theta | hyper) + (N / n) sum over the batch of log p(y_i | theta), the unbiased
     * mini-batch estimate of the log posterior (exact for a full batch); its gradient is written
     * to {@code grad}, overwriting it.
     */
    double logDensity(float[] theta, double[] hyper, Batch batch, float[] grad);

    /** Hyperparameters a chain starts with; null when there are none. */
    default double[] initialHyper() {
        return null;
    }

    /** A Gibbs step for the hyperparameters given theta, between Langevin steps; none by default. */
    default double[] resampleHyper(float[] theta, double[] hyper, SplittableRandom rng) {
        return hyper;
    }
}
