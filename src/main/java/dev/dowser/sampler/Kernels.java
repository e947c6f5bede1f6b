package dev.dowser.sampler;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;

/** What the kernels share: evaluating a fresh state, checking the temperature, storing floats. */
final class Kernels {

    private Kernels() {
    }

    /** The target evaluated at {@code position}, with the step count carried on from {@code previous}. */
    static <E extends KernelState> State<E> evaluate(Target target, float[] position, double[] hyper, double stepSize,
                                                     Batch batch, State<?> previous, E extra) {
        float[] grad = new float[position.length];
        double logp = target.logDensity(position, hyper, batch, grad);
        return new State<>(position.clone(), grad, logp, hyper, stepSize, previous == null ? 0 : previous.step(), extra);
    }

    static double checkTemperature(double t) {
        if (!(t > 0) || Double.isInfinite(t)) {
            throw new IllegalArgumentException("temperature must be positive and finite, got " + t
                    + "; 1 samples the true posterior");
        }
        return t;
    }

    /** float32 little-endian. */
    static byte[] bytes(float[] v) {
        ByteBuffer b = ByteBuffer.allocate(4 * v.length).order(ByteOrder.LITTLE_ENDIAN);
        b.asFloatBuffer().put(v);
        return b.array();
    }

    static float[] floats(byte[] bytes) {
        float[] v = new float[bytes.length / 4];
        ByteBuffer.wrap(bytes).order(ByteOrder.LITTLE_ENDIAN).asFloatBuffer().get(v);
        return v;
    }
}
