package dev.dowser.sampler;

import dev.dowser.stats.RandomVariates;
import java.util.SplittableRandom;

/**
 * Stochastic gradient Langevin dynamics (Welling & Teh 2011, "Bayesian Learning via Stochastic
 * Gradient Langevin Dynamics", eq. 4): theta' = theta + eps/2 * g + eta, eta ~ N(0, eps), where g
 * is the mini-batch estimate of the log posterior's gradient (likelihood scaled by N/n). At
 * temperature T the target is p^(1/T), so g is divided by T and the noise is unchanged.
 */
public final class Sgld implements Kernel<Sgld.Plain> {

    /** SGLD keeps nothing beside the position. */
    public record Plain() implements KernelState {

        static final Plain INSTANCE = new Plain();

        @Override
        public byte[] encode() {
            return new byte[0];
        }

        static Plain decode(byte[] bytes) {
            return INSTANCE;
        }
    }

    private final Target target;
    private final double temperature;
    private final Buffers buffers;

    public Sgld(Target target, double temperature) {
        this.target = target;
        this.temperature = Kernels.checkTemperature(temperature);
        this.buffers = new Buffers(target.dimension(), false);
    }

    @Override
    public State<Plain> step(State<Plain> s, Batch batch, SplittableRandom rng) {
        double eps = s.stepSize();
        float half = (float) (eps / 2 / temperature);
        double sd = Math.sqrt(eps);
        float[] x = s.position();
        int set = buffers.free(s);
        float[] next = buffers.position(set);
        float[] g = s.gradient();
        for (int i = 0; i < x.length; i++) {
            next[i] = (float) (x[i] + half * g[i] + sd * RandomVariates.normal(rng));
        }
        return buffers.next(set, s, target, batch, Plain.INSTANCE);
    }

    @Override
    public String name() {
        return "sgld";
    }

    @Override
    public State<Plain> start(float[] position, double[] hyper, double stepSize, Batch batch, State<?> previous) {
        return Kernels.evaluate(target, position, hyper, stepSize, batch, previous, Plain.INSTANCE);
    }
}
