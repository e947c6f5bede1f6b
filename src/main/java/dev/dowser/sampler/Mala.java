package dev.dowser.sampler;

import dev.dowser.stats.RandomVariates;
import java.util.SplittableRandom;

/**
 * The Metropolis-adjusted Langevin algorithm (Roberts & Tweedie 1996, "Exponential convergence of
 * Langevin distributions and their discrete approximations"): propose
 * theta* = theta + eps/2 * grad log pi(theta) + sqrt(eps) xi, xi ~ N(0, I), and accept with
 * probability min(1, pi(theta*) q(theta | theta*) / (pi(theta) q(theta* | theta))), where
 * log q(b | a) = -|b - a - eps/2 grad log pi(a)|^2 / (2 eps). Full-batch gradients, so the draws
 * are exact in the limit. At temperature T, pi = p^(1/T).
 */
public final class Mala implements Kernel {

    /** The acceptance rate that is optimal as dimension grows (Roberts & Rosenthal 1998). */
    public static final double TARGET_ACCEPTANCE = 0.574;

    private final Target target;
    private final double temperature;
    private final Buffers buffers;

    public Mala(Target target, double temperature) {
        this.target = target;
        this.temperature = Kernels.checkTemperature(temperature);
        this.buffers = new Buffers(target.dimension(), false);
    }

    @Override
    public State step(State s, Batch batch, SplittableRandom rng) {
        double eps = s.stepSize();
        double sd = Math.sqrt(eps);
        float[] x = s.position();
        float[] gx = s.gradient();
        double invT = 1 / temperature;
        int set = buffers.free(s);
        float[] y = buffers.position(set);
        for (int i = 0; i < x.length; i++) {
            y[i] = (float) (x[i] + eps / 2 * invT * gx[i] + sd * RandomVariates.normal(rng));
        }
        float[] gy = buffers.gradient(set);
        double logpY = target.logDensity(y, s.hyper(), Batch.full(target.dataSize()), gy);
        double logRatio = invT * (logpY - s.logDensity()) + logQ(x, y, gy, eps, invT) - logQ(y, x, gx, eps, invT);
        boolean accept = Double.isFinite(logpY) && Math.log(rng.nextDouble()) < logRatio;
        if (accept) {
            return new State(y, gy, logpY, null, s.hyper(), s.stepSize(), s.step() + 1, s.accepted() + 1,
                    s.proposed() + 1);
        }
        return new State(x, gx, s.logDensity(), null, s.hyper(), s.stepSize(), s.step() + 1, s.accepted(),
                s.proposed() + 1);
    }

    /** log q(to | from) up to a constant: -|to - from - eps/2 grad(from)|^2 / (2 eps). */
    private static double logQ(float[] to, float[] from, float[] gradFrom, double eps, double invT) {
        double ss = 0;
        for (int i = 0; i < to.length; i++) {
            double d = to[i] - from[i] - eps / 2 * invT * gradFrom[i];
            ss += d * d;
        }
        return -ss / (2 * eps);
    }

    @Override
    public boolean fullBatch() {
        return true;
    }

    @Override
    public String name() {
        return "mala";
    }

    @Override
    public State start(float[] position, double[] hyper, double stepSize, Batch batch) {
        return Kernels.evaluate(target, position, hyper, stepSize, Batch.full(target.dataSize()));
    }
}
