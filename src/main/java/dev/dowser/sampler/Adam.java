package dev.dowser.sampler;

/**
 * Adam (Kingma & Ba 2015, "Adam: A Method for Stochastic Optimization", Algorithm 1), climbing a
 * log density: m = b1 m + (1 - b1) g; v = b2 v + (1 - b2) g^2; theta += a * mhat / (sqrt(vhat) +
 * eps), with mhat = m / (1 - b1^t) and vhat = v / (1 - b2^t). The gradient is taken per datum (the
 * log density's divided by N), so the default step suits any data size. Holds its moments: one
 * instance per parameter vector.
 */
public final class Adam {

    public static final double DEFAULT_LEARNING_RATE = 1e-3;
    static final double BETA1 = 0.9;
    static final double BETA2 = 0.999;
    static final double EPSILON = 1e-8;

    private final double learningRate;
    private final float[] m;
    private final float[] v;
    private long t;

    public Adam(int dimension, double learningRate) {
        if (!(learningRate > 0)) {
            throw new IllegalArgumentException("Adam's learning rate must be positive, got " + learningRate);
        }
        this.learningRate = learningRate;
        this.m = new float[dimension];
        this.v = new float[dimension];
    }

    /** One ascent step on {@code theta} in place, from {@code grad}, the gradient per datum. */
    public void step(float[] theta, float[] grad) {
        t++;
        double a = learningRate * Math.sqrt(1 - Math.pow(BETA2, t)) / (1 - Math.pow(BETA1, t));
        float b1 = (float) BETA1;
        float b2 = (float) BETA2;
        for (int i = 0; i < theta.length; i++) {
            float g = grad[i];
            m[i] = b1 * m[i] + (1 - b1) * g;
            v[i] = b2 * v[i] + (1 - b2) * g * g;
            // The bias corrections folded into the step a (the paper's section 2, last paragraph).
            theta[i] += (float) (a * m[i] / (Math.sqrt(v[i]) + EPSILON));
        }
    }
}
