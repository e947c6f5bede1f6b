package dev.dowser.sampler;

import dev.dowser.stats.RandomVariates;
import java.util.SplittableRandom;

/**
 * Preconditioned SGLD with the RMSprop preconditioner (Li, Chen, Carlson & Carin 2016,
 * "Preconditioned Stochastic Gradient Langevin Dynamics for Deep Neural Networks", Algorithm 1):
 * V = alpha V + (1 - alpha) gbar * gbar; G = 1 / (lambda + sqrt(V));
 * theta' = theta + eps/2 * G * g + N(0, eps G), with the correction term Gamma dropped, as the
 * paper allows for small step sizes. gbar is the gradient estimate per datum, g / N; unlike the
 * paper's likelihood-only average it includes the prior's share (grad log p(theta) / N), which
 * spares a second gradient pass and changes V by a term of order 1/N.
 */
public final class PreconditionedSgld implements Kernel<PreconditionedSgld.Preconditioner> {

    /** V, the running mean square of the per-datum gradient, one entry per weight. */
    public record Preconditioner(float[] v) implements KernelState {

        @Override
        public byte[] encode() {
            return Kernels.bytes(v);
        }

        static Preconditioner decode(byte[] bytes) {
            return new Preconditioner(Kernels.floats(bytes));
        }
    }


    public static final double DEFAULT_ALPHA = 0.99;
    public static final double DEFAULT_LAMBDA = 1e-5;

    private final Target target;
    private final double temperature;
    private final float alpha;
    private final float lambda;
    private final Buffers buffers;
    private final float[] noiseScale;

    public PreconditionedSgld(Target target, double temperature) {
        this(target, temperature, DEFAULT_ALPHA, DEFAULT_LAMBDA);
    }

    public PreconditionedSgld(Target target, double temperature, double alpha, double lambda) {
        if (!(alpha > 0 && alpha < 1)) {
            throw new IllegalArgumentException("alpha must lie strictly between 0 and 1, got " + alpha);
        }
        if (!(lambda > 0)) {
            throw new IllegalArgumentException("lambda must be positive, got " + lambda);
        }
        this.target = target;
        this.temperature = Kernels.checkTemperature(temperature);
        this.alpha = (float) alpha;
        this.lambda = (float) lambda;
        this.buffers = new Buffers(target.dimension(), true);
        this.noiseScale = new float[target.dimension()];
    }

    @Override
    public State<Preconditioner> step(State<Preconditioner> s, Batch batch, SplittableRandom rng) {
        double eps = s.stepSize();
        float[] x = s.position();
        float[] g = s.gradient();
        float[] v = s.extra().v();
        int set = buffers.free(s);
        float[] nextV = buffers.extra(set);
        float[] next = buffers.position(set);
        float perDatum = 1f / target.dataSize();
        float half = (float) (eps / 2 / temperature);
        float sqrtEps = (float) Math.sqrt(eps);
        // Two passes: the first, free of calls and branches, vectorises; the second adds the noise.
        float[] sd = noiseScale;
        for (int i = 0; i < x.length; i++) {
            float gbar = g[i] * perDatum;
            float vi = alpha * v[i] + (1 - alpha) * gbar * gbar;
            nextV[i] = vi;
            float precond = 1f / (lambda + (float) Math.sqrt(vi));
            next[i] = x[i] + half * precond * g[i];
            sd[i] = sqrtEps * (float) Math.sqrt(precond);
        }
        for (int i = 0; i < x.length; i++) {
            next[i] += (float) (sd[i] * RandomVariates.normal(rng));
        }
        return buffers.next(set, s, target, batch, new Preconditioner(nextV));
    }

    @Override
    public String name() {
        return "psgld";
    }

    /**
     * Continues the running mean square V of a previous preconditioned chain on the same network;
     * a new chain starts V at the first gradient's square, so its first steps are not wildly large.
     */
    @Override
    public State<Preconditioner> start(float[] position, double[] hyper, double stepSize, Batch batch,
                                       State<?> previous) {
        State<Preconditioner> first = Kernels.evaluate(target, position, hyper, stepSize, batch, previous, null);
        if (previous != null && previous.extra() instanceof Preconditioner p && p.v().length == position.length) {
            return first.withExtra(new Preconditioner(p.v().clone()));
        }
        float[] grad = first.gradient();
        float[] v = new float[position.length];
        float perDatum = 1f / target.dataSize();
        for (int i = 0; i < v.length; i++) {
            v[i] = grad[i] * perDatum * grad[i] * perDatum;
        }
        return first.withExtra(new Preconditioner(v));
    }
}
