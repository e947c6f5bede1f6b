package dev.dowser.model;

import dev.dowser.words.Worded;

/** The hidden layers' nonlinearity. */
public enum Activation implements Worded {
    RELU,
    TANH;

    public static Activation parse(String word) {
        return Worded.parse(Activation.class, word, "activation");
    }

    /** a = f(z), in place over {@code n} values from {@code off}. */
    void apply(float[] z, int off, int n) {
        if (this == RELU) {
            // Written without a branch: signs are random, and a mispredicted branch per unit
            // cost more than the matrix product feeding it (measured with dowser bench).
            for (int i = off; i < off + n; i++) {
                z[i] = Math.max(z[i], 0f);
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
            // a >= 0 here, so a > 0 exactly when its bits are positive; -bits >>> 31 is then 1, and
            // -(that) is an all-ones mask. Integer masking keeps the loop free of branches.
            for (int i = 0; i < n; i++) {
                int keep = -((-Float.floatToRawIntBits(a[i])) >>> 31);
                delta[i] = Float.intBitsToFloat(Float.floatToRawIntBits(delta[i]) & keep);
            }
        } else {
            for (int i = 0; i < n; i++) {
                delta[i] *= 1f - a[i] * a[i];
            }
        }
    }
}
