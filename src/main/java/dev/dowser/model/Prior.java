package dev.dowser.model;

import dev.dowser.stats.RandomVariates;
import dev.dowser.stats.LogGamma;
import java.util.SplittableRandom;

/**
 * The prior over the flat parameter vector: each layer's weights N(0, (s / sqrt(fanIn))^2), so a
 * unit's input variance does not grow with its fan-in; biases N(0, biasScale^2). Optionally
 * hierarchical (Neal 1996, "Bayesian Learning for Neural Networks", ch. 1.2 and 3.2): each
 * layer's weight precision tau_l has a Gamma(shape, rate_l) hyperprior, with rate_l chosen so
 * the prior mean precision is fanIn / s^2, and is resampled by its conjugate Gibbs step
 * tau_l | w ~ Gamma(shape + n_l / 2, rate_l + sum(w^2) / 2) between Langevin steps. Or
 * heavy-tailed (Fortuin et al. 2022, "Bayesian Neural Network Priors Revisited", which found such
 * priors suit fully connected networks): each weight Student-t with nu degrees of freedom and the
 * same scale sigma_l = s / sqrt(fanIn).
 *
 * @param weightScale  s
 * @param biasScale    standard deviation of every bias
 * @param hierarchical whether layer precisions are sampled
 * @param hyperShape   shape of the Gamma hyperprior (used when hierarchical)
 * @param tailDegrees  nu of a Student-t weight prior; 0 for the Gaussian
 */
public record Prior(double weightScale, double biasScale, boolean hierarchical, double hyperShape,
                    double tailDegrees) {

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
        if (!(tailDegrees >= 0) || Double.isInfinite(tailDegrees)) {
            throw new IllegalArgumentException("the prior's degrees of freedom must be 0 (Gaussian) or positive, got "
                    + tailDegrees);
        }
        if (hierarchical && tailDegrees > 0) {
            throw new IllegalArgumentException("a hierarchical prior is Gaussian: set the degrees of freedom to 0");
        }
    }

    /** A Gaussian prior. */
    public Prior(double weightScale, double biasScale, boolean hierarchical, double hyperShape) {
        this(weightScale, biasScale, hierarchical, hyperShape, 0);
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
            logp += tailDegrees > 0 ? studentT(theta, w0, nw, tau[l]) : gaussian(theta, w0, nw, tau[l]);
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

    // log t_nu(x | 0, sigma^2 = 1/tau) summed: n [lgamma((nu+1)/2) - lgamma(nu/2) - log(nu pi sigma^2)/2]
    //   - (nu+1)/2 sum log(1 + tau x^2 / nu)
    private double studentT(float[] x, int off, int n, double tau) {
        double nu = tailDegrees;
        double s = 0;
        for (int i = off; i < off + n; i++) {
            s += Math.log1p(tau * x[i] * x[i] / nu);
        }
        double norm = LogGamma.of((nu + 1) / 2) - LogGamma.of(nu / 2) - 0.5 * Math.log(nu * Math.PI / tau);
        return n * norm - (nu + 1) / 2 * s;
    }

    /**
     * grad = d log p(theta | tau) / d theta, overwriting grad: it starts a gradient. Gaussian:
     * -tau theta; Student-t: -(nu + 1) tau theta / (nu + tau theta^2).
     */
    public void setGradient(Layout layout, float[] theta, double[] tau, float[] grad) {
        double biasPrecision = 1 / (biasScale * biasScale);
        for (int l = 0; l < tau.length; l++) {
            if (tailDegrees > 0) {
                studentTGradient(theta, grad, layout.weightOffset(l), layout.weightCount(l), tau[l]);
            } else {
                scaleTo(theta, grad, layout.weightOffset(l), layout.weightCount(l), (float) -tau[l]);
            }
            scaleTo(theta, grad, layout.biasOffset(l), layout.architecture().fanOut(l), (float) -biasPrecision);
        }
    }

    private void studentTGradient(float[] x, float[] y, int off, int n, double tau) {
        float nu = (float) tailDegrees;
        float t = (float) tau;
        for (int i = off; i < off + n; i++) {
            y[i] = -(nu + 1) * t * x[i] / (nu + t * x[i] * x[i]);
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
