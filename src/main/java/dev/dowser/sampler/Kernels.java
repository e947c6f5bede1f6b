package dev.dowser.sampler;

/** Checks shared by the kernels. */
final class Kernels {

    private Kernels() {
    }

    static double checkTemperature(double t) {
        if (!(t > 0) || Double.isInfinite(t)) {
            throw new IllegalArgumentException("temperature must be positive and finite, got " + t
                    + "; 1 samples the true posterior");
        }
        return t;
    }
}
