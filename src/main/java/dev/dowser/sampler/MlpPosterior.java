package dev.dowser.sampler;

import dev.dowser.model.Layout;
import dev.dowser.model.Mlp;
import dev.dowser.model.Prior;
import java.util.SplittableRandom;

/**
 * The network's posterior given labelled rows: log p(theta | tau) + sum_i log p(y_i | x_i, theta),
 * the likelihood estimated from a mini-batch as (N / n) times its sum. Holds work buffers: one
 * instance per chain.
 */
public final class MlpPosterior implements Target {

    private final Layout layout;
    private final Prior prior;
    private final Mlp mlp;
    private final float[] x;
    private final int[] labels;
    private final int rows;
    private final double[] fixedPrecisions;

    /**
     * @param x      the labelled rows' standardised features, row-major
     * @param labels their class indices
     */
    public MlpPosterior(Layout layout, Prior prior, float[] x, int[] labels, int workRows) {
        int d = layout.architecture().inputs();
        if (x.length % d != 0 || x.length / d != labels.length) {
            throw new IllegalArgumentException(labels.length + " labels for " + x.length / d + " rows of features");
        }
        this.layout = layout;
        this.prior = prior;
        this.mlp = new Mlp(layout, workRows);
        this.x = x;
        this.labels = labels;
        this.rows = labels.length;
        this.fixedPrecisions = prior.initialPrecisions(layout);
    }

    @Override
    public int dimension() {
        return layout.dimension();
    }

    @Override
    public int dataSize() {
        return rows;
    }

    public Layout layout() {
        return layout;
    }

    @Override
    public double logDensity(float[] theta, double[] hyper, Batch batch, float[] grad) {
        double[] tau = hyper != null ? hyper : fixedPrecisions;
        // The prior's gradient starts grad (no separate zeroing pass); the likelihood's is added to it.
        prior.setGradient(layout, theta, tau, grad);
        double scale = (double) rows / batch.size();
        double logLik = mlp.logLikelihood(theta, x, labels, batch.rows(), 0, batch.size(), grad, (float) scale);
        return prior.logDensity(layout, theta, tau) + scale * logLik;
    }

    /** Sum of log p(y_i | x_i, theta) over every labelled row: the function-space summary of a draw. */
    public double logLikelihood(float[] theta) {
        return mlp.logLikelihood(theta, x, labels, null, 0, rows, null, 0f);
    }

    @Override
    public double[] initialHyper() {
        return prior.hierarchical() ? prior.initialPrecisions(layout) : null;
    }

    @Override
    public double[] resampleHyper(float[] theta, double[] hyper, SplittableRandom rng) {
        return prior.hierarchical() ? prior.resamplePrecisions(layout, theta, rng) : hyper;
    }
}
