package dev.dowser.sampler;

/** Checks shared by the kernels. */
final class Kernels {

    private Kernels() {
    }

    /** A fresh state at {@code position}: the target evaluated there, counters at zero. */
    static State evaluate(Target target, float[] position, double[] hyper, double stepSize, Batch batch) {
        float[] grad = new float[position.length];
        double logp = target.logDensity(position, hyper, batch, grad);
        return new State(position.clone(), grad, logp, null, hyper, stepSize, 0, 0, 0);
    }

    static double checkTemperature(double t) {
        if (!(t > 0) || Double.isInfinite(t)) {
            throw new IllegalArgumentException("temperature must be positive and finite, got " + t
                    + "; 1 samples the true posterior");
        }
        return t;
    }
}
