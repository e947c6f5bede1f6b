package dev.dowser.model;

/** The hidden layers' nonlinearity. */
public enum Activation {
    RELU,
    TANH;

    /** a = f(z), in place over {@code n} values from {@code off}. */
    void apply(float[] z, int off, int n) {
        if (this == RELU) {
            for (int i = off; i < off + n; i++) {
                if (z[i] < 0f) {
                    z[i] = 0f;
                }
            }
        } else {
            for (int i = off; i < off + n; i++) {
                z[i] = (float) Math.tanh(z[i]);
            }
        }
    }

    /**
     * delta *= f'(z), given the activations a = f(z): ReLU's derivative is 1 where a > 0, and
     * tanh's is 1 - a^2, so neither needs z again.
     */
    void backward(float[] a, float[] delta, int n) {
        if (this == RELU) {
            for (int i = 0; i < n; i++) {
                if (a[i] <= 0f) {
                    delta[i] = 0f;
                }
            }
        } else {
            for (int i = 0; i < n; i++) {
                delta[i] *= 1f - a[i] * a[i];
            }
        }
    }
}
