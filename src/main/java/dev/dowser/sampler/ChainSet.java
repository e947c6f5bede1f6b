package dev.dowser.sampler;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

/**
 * Runs several chains at once on a bounded pool of threads, one chain per task, so chains, not
 * matrix products, are what runs in parallel. Results come back in chain order whatever the
 * finishing order, so a run is reproducible from its seeds.
 */
public final class ChainSet implements AutoCloseable {

    /** One chain's part in a round. */
    public record Job<E extends KernelState>(Chain<E> chain, State<E> start) {

        ChainRun run(ChainConfig config, StopSignal stop) {
            return chain.run(start, config, stop);
        }
    }

    /**
     * Chain {@code index} running {@code kernel} on {@code target}, started at {@code position}
     * (continuing {@code previous}, or null for a new chain).
     */
    public static <E extends KernelState> Job<E> job(int index, Kernel<E> kernel, Target target, SplittableRandom rng,
                                                     float[] position, double[] hyper, double stepSize, Batch first,
                                                     State<?> previous) {
        return new Job<>(new Chain<>(index, kernel, target, rng), kernel.start(position, hyper, stepSize, first,
                previous));
    }

    private final ExecutorService pool;

    public ChainSet(int threads) {
        if (threads < 1) {
            throw new IllegalArgumentException("a chain set needs at least one thread, got " + threads);
        }
        this.pool = Executors.newFixedThreadPool(threads, r -> {
            Thread t = new Thread(r, "dowser-chain");
            t.setDaemon(true);
            return t;
        });
    }

    public List<ChainRun> run(List<Job<?>> jobs, ChainConfig config) {
        return run(jobs, config, StopSignal.never());
    }

    /** Runs every job to its end, or each to its next safe point once {@code stop} is raised. */
    public List<ChainRun> run(List<Job<?>> jobs, ChainConfig config, StopSignal stop) {
        List<Future<ChainRun>> futures = new ArrayList<>();
        for (Job<?> job : jobs) {
            futures.add(pool.submit(() -> job.run(config, stop)));
        }
        List<ChainRun> out = new ArrayList<>();
        try {
            for (Future<ChainRun> f : futures) {
                out.add(f.get());
            }
        } catch (InterruptedException e) {
            futures.forEach(f -> f.cancel(true));
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted while sampling", e);
        } catch (ExecutionException e) {
            futures.forEach(f -> f.cancel(true));
            Throwable cause = e.getCause();
            if (cause instanceof RuntimeException re) {
                throw re;
            }
            throw new IllegalStateException("a chain failed: " + cause, cause);
        }
        return out;
    }

    @Override
    public void close() {
        pool.shutdownNow();
    }
}
