package dev.dowser.sampler;

import dev.dowser.stats.RandomVariates;
import java.util.SplittableRandom;

/**
 * Stochastic gradient Hamiltonian Monte Carlo (Chen, Fox & Guestrin 2014, "Stochastic Gradient
 * Hamiltonian Monte Carlo", eq. 15, with the noise estimate beta-hat = 0):
 * v' = (1 - alpha) v + eta g / T + N(0, 2 alpha eta); theta' = theta + v', with g the mini-batch
 * estimate of the log posterior's gradient and alpha the friction. The momentum lets a chain keep
 * its direction over about 1 / alpha steps instead of turning at random every step.
 *
 * <p>eta = alpha eps / 2, so that the momentum's steady drift per step, eta g / alpha, equals
 * SGLD's eps/2 g at the same step size eps (the learning rate means the same for every kernel),
 * and at alpha = 1 the kernel is SGLD exactly.
 */
public final class Sghmc implements Kernel<Sghmc.Momentum> {

    /** Friction alpha: the momentum forgets its direction over about 1 / alpha = 10 steps. */
    public static final double DEFAULT_FRICTION = 0.1;

    /** v, one entry per weight. */
    public record Momentum(float[] v) implements KernelState {

        @Override
        public byte[] encode() {
            return Kernels.bytes(v);
        }

        static Momentum decode(byte[] bytes) {
            return new Momentum(Kernels.floats(bytes));
        }
    }

    private final Target target;
    private final double temperature;
    private final double friction;
    private final Buffers buffers;

    public Sghmc(Target target, double temperature) {
        this(target, temperature, DEFAULT_FRICTION);
    }

    public Sghmc(Target target, double temperature, double friction) {
        if (!(friction > 0 && friction <= 1)) {
            throw new IllegalArgumentException("friction must lie in (0, 1], got " + friction);
        }
        this.target = target;
        this.temperature = Kernels.checkTemperature(temperature);
        this.friction = friction;
        this.buffers = new Buffers(target.dimension(), true);
    }

    @Override
    public State<Momentum> step(State<Momentum> s, Batch batch, SplittableRandom rng) {
        double eta = friction * s.stepSize() / 2;
        float keep = (float) (1 - friction);
        float drift = (float) (eta / temperature);
        double sd = Math.sqrt(2 * friction * eta);
        float[] x = s.position();
        float[] g = s.gradient();
        float[] v = s.extra().v();
        int set = buffers.free(s);
        float[] nextV = buffers.extra(set);
        float[] next = buffers.position(set);
        for (int i = 0; i < x.length; i++) {
            float vi = (float) (keep * v[i] + drift * g[i] + sd * RandomVariates.normal(rng));
            nextV[i] = vi;
            next[i] = x[i] + vi;
        }
        return buffers.next(set, s, target, batch, new Momentum(nextV));
    }

    @Override
    public String name() {
        return "sghmc";
    }

    /** A continued SGHMC chain keeps its momentum; a new one starts at rest. */
    @Override
    public State<Momentum> start(float[] position, double[] hyper, double stepSize, Batch batch, State<?> previous) {
        float[] v = previous != null && previous.extra() instanceof Momentum m && m.v().length == position.length
                ? m.v().clone() : new float[position.length];
        return Kernels.evaluate(target, position, hyper, stepSize, batch, previous, new Momentum(v));
    }
}
