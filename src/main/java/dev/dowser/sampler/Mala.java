package dev.dowser.sampler;

import dev.dowser.stats.RandomVariates;
import java.nio.ByteBuffer;
import java.util.SplittableRandom;

/**
 * The Metropolis-adjusted Langevin algorithm (Roberts & Tweedie 1996, "Exponential convergence of
 * Langevin distributions and their discrete approximations"): propose
 * theta* = theta + eps/2 * grad log pi(theta) + sqrt(eps) xi, xi ~ N(0, I), and accept with
 * probability min(1, pi(theta*) q(theta | theta*) / (pi(theta) q(theta* | theta))), where
 * log q(b | a) = -|b - a - eps/2 grad log pi(a)|^2 / (2 eps). Full-batch gradients, so the draws
 * are exact in the limit. At temperature T, pi = p^(1/T). During burn-in the step is tuned toward
 * an acceptance of 0.574, and a continued chain keeps its tuned step.
 */
public final class Mala implements Kernel<Mala.Counts> {

    /** The acceptance rate that is optimal as dimension grows (Roberts & Rosenthal 1998). */
    public static final double TARGET_ACCEPTANCE = 0.574;
    /** Robbins-Monro gain for step-size tuning: gamma_k = ADAPT_GAIN / sqrt(k + 10). */
    static final double ADAPT_GAIN = 1.0;

    /** Proposals accepted and made since the chain began. */
    public record Counts(long accepted, long proposed) implements KernelState {

        static final Counts NONE = new Counts(0, 0);

        @Override
        public byte[] encode() {
            return ByteBuffer.allocate(16).putLong(accepted).putLong(proposed).array();
        }

        static Counts decode(byte[] bytes) {
            ByteBuffer b = ByteBuffer.wrap(bytes);
            return new Counts(b.getLong(), b.getLong());
        }

        @Override
        public double acceptanceRate() {
            return proposed == 0 ? Double.NaN : (double) accepted / proposed;
        }
    }

    private final Target target;
    private final double temperature;
    private final Buffers buffers;

    public Mala(Target target, double temperature) {
        this.target = target;
        this.temperature = Kernels.checkTemperature(temperature);
        this.buffers = new Buffers(target.dimension(), false);
    }

    @Override
    public State<Counts> step(State<Counts> s, Batch batch, SplittableRandom rng) {
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
        Counts c = s.extra();
        State<Counts> proposed = buffers.next(set, s, target, Batch.full(target.dataSize()),
                new Counts(c.accepted() + 1, c.proposed() + 1));
        double logpY = proposed.logDensity();
        double logRatio = invT * (logpY - s.logDensity()) + logQ(x, y, proposed.gradient(), eps, invT)
                - logQ(y, x, gx, eps, invT);
        if (Double.isFinite(logpY) && Math.log(rng.nextDouble()) < logRatio) {
            return proposed;
        }
        return new State<>(x, gx, s.logDensity(), s.hyper(), s.stepSize(), s.step() + 1,
                new Counts(c.accepted(), c.proposed() + 1));
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

    /**
     * Robbins-Monro on the log step toward the target acceptance (stochastic approximation as in
     * Andrieu & Thoms 2008, "A tutorial on adaptive MCMC"): log eps += gamma_k (accepted - 0.574),
     * gamma_k = 1 / sqrt(k + 10).
     */
    @Override
    public State<Counts> adapt(State<Counts> before, State<Counts> after, long k) {
        double accepted = after.extra().accepted() - before.extra().accepted();
        double gamma = ADAPT_GAIN / Math.sqrt(k + 10);
        return after.withStepSize(after.stepSize() * Math.exp(gamma * (accepted - TARGET_ACCEPTANCE)));
    }

    @Override
    public boolean fullBatch() {
        return true;
    }

    @Override
    public String name() {
        return "mala";
    }

    /** A continued MALA chain keeps its counts and its tuned step; any other starts at {@code stepSize}. */
    @Override
    public State<Counts> start(float[] position, double[] hyper, double stepSize, Batch batch, State<?> previous) {
        if (previous != null && previous.extra() instanceof Counts c) {
            return Kernels.evaluate(target, position, hyper, previous.stepSize(), Batch.full(target.dataSize()),
                    previous, c);
        }
        return Kernels.evaluate(target, position, hyper, stepSize, Batch.full(target.dataSize()), previous,
                Counts.NONE);
    }
}
