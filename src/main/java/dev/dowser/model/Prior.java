package dev.dowser.model;

import dev.dowser.stats.RandomVariates;
import java.util.SplittableRandom;

/**
 * The prior over the flat parameter vector: each layer's weights N(0, (s / sqrt(fanIn))^2), so a
 * unit's input variance does not grow with its fan-in; biases N(0, biasScale^2). Optionally
 * hierarchical (Neal 1996, "Bayesian Learning for Neural Networks", ch. 1.2 and 3.2): each
 * layer's weight precision tau_l has a Gamma(shape, rate_l) hyperprior, with rate_l chosen so
 * the prior mean precision is fanIn / s^2, and is resampled by its conjugate Gibbs step
 * tau_l | w ~ Gamma(shape + n_l / 2, rate_l + sum(w^2) / 2) between Langevin steps.
 *
 * @param weightScale s
 * @param biasScale   standard deviation of every bias
 * @param hierarchical whether layer precisions are sampled
 * @param hyperShape  shape of the Gamma hyperprior (used when hierarchical)
 */
public record Prior(double weightScale, double biasScale, boolean hierarchical, double hyperShape) {

    /** Chosen by measurement; see DEVELOPERS.md ("the prior scale"). */
    public static final double DEFAULT_WEIGHT_SCALE = 3.0;
    public static final double DEFAULT_BIAS_SCALE = 1.0;
    public static final double DEFAULT_HYPER_SHAPE = 2.0;
    private static final double HALF_LOG_2PI = 0.5 * Math.log(2 * Math.PI);

    public Prior {
        if (!(weightScale > 0) || !(biasScale > 0)) {
            throw new IllegalArgumentException("prior scales must be positive, got weight scale " + weightScale
                    + " and bias scale " + biasScale);
        }
        if (hierarchical && !(hyperShape > 0)) {
            throw new IllegalArgumentException("the hyperprior shape must be positive, got " + hyperShape);
        }
    }

    public static Prior standard() {
        return new Prior(DEFAULT_WEIGHT_SCALE, DEFAULT_BIAS_SCALE, false, DEFAULT_HYPER_SHAPE);
    }

    /** The fixed weight precision of a layer: fanIn / s^2. */
    public double precision(Layout layout, int layer) {
        return layout.architecture().fanIn(layer) / (weightScale * weightScale);
    }

    /** Layer precisions to start a chain with: the fixed ones, or the hyperprior means. */
    public double[] initialPrecisions(Layout layout) {
        double[] tau = new double[layout.architecture().layers()];
        for (int l = 0; l < tau.length; l++) {
            tau[l] = precision(layout, l);
        }
        return tau;
    }

    /** log p(theta | tau), normalised; tau holds one weight precision per layer. */
    public double logDensity(Layout layout, float[] theta, double[] tau) {
        double logp = 0;
        double biasPrecision = 1 / (biasScale * biasScale);
        for (int l = 0; l < tau.length; l++) {
            int w0 = layout.weightOffset(l);
            int nw = layout.weightCount(l);
            logp += gaussian(theta, w0, nw, tau[l]);
            logp += gaussian(theta, layout.biasOffset(l), layout.architecture().fanOut(l), biasPrecision);
        }
        return logp;
    }

    // log N(x | 0, 1/tau) summed: -tau/2 sum x^2 + n/2 log tau - n/2 log 2pi
    private static double gaussian(float[] x, int off, int n, double tau) {
        double ss = 0;
        for (int i = off; i < off + n; i++) {
            ss += (double) x[i] * x[i];
        }
        return -0.5 * tau * ss + n * (0.5 * Math.log(tau) - HALF_LOG_2PI);
    }

    /** grad = d log p(theta | tau) / d theta = -tau * theta, overwriting grad: it starts a gradient. */
    public void setGradient(Layout layout, float[] theta, double[] tau, float[] grad) {
        double biasPrecision = 1 / (biasScale * biasScale);
        for (int l = 0; l < tau.length; l++) {
            scaleTo(theta, grad, layout.weightOffset(l), layout.weightCount(l), (float) -tau[l]);
            scaleTo(theta, grad, layout.biasOffset(l), layout.architecture().fanOut(l), (float) -biasPrecision);
        }
    }

    private static void scaleTo(float[] x, float[] y, int off, int n, float a) {
        for (int i = off; i < off + n; i++) {
            y[i] = a * x[i];
        }
    }

    /**
     * The conjugate Gibbs step of the hierarchical prior: new layer precisions given the weights.
     * Returns the fixed precisions when the prior is not hierarchical.
     */
    public double[] resamplePrecisions(Layout layout, float[] theta, SplittableRandom rng) {
        double[] tau = initialPrecisions(layout);
        if (!hierarchical) {
            return tau;
        }
        for (int l = 0; l < tau.length; l++) {
            double rate = hyperShape / tau[l];
            int w0 = layout.weightOffset(l);
            int nw = layout.weightCount(l);
            double ss = 0;
            for (int i = w0; i < w0 + nw; i++) {
                ss += (double) theta[i] * theta[i];
            }
            tau[l] = RandomVariates.gamma(rng, hyperShape + 0.5 * nw, rate + 0.5 * ss);
        }
        return tau;
    }

    /**
     * A starting point for a chain: weights N(0, 1 / fanIn), biases 0; the usual scaled start,
     * narrower than the prior so that the first gradients are moderate.
     */
    public static float[] start(Layout layout, SplittableRandom rng) {
        float[] theta = new float[layout.dimension()];
        Architecture a = layout.architecture();
        for (int l = 0; l < a.layers(); l++) {
            double sd = 1 / Math.sqrt(a.fanIn(l));
            int w0 = layout.weightOffset(l);
            for (int i = w0; i < w0 + layout.weightCount(l); i++) {
                theta[i] = (float) (sd * rng.nextGaussian());
            }
        }
        return theta;
    }
}
