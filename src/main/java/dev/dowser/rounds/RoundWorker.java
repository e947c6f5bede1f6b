package dev.dowser.rounds;

import dev.dowser.sampler.StopSignal;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicReference;

/**
 * A pool's background worker: runs a round on request, and by itself after every {@code batch}
 * new labels. Labelling never waits for it: people keep taking records from the queue being
 * served while the next is computed. Requests that arrive during a round fold into one more round
 * after it. Closing stops a running round at its chains' next safe point (their states are saved,
 * the served queue stays) and starts no more.
 */
public final class RoundWorker implements AutoCloseable {

    static final long CLOSE_WAIT_SECONDS = 120;

    private final RoundService service;
    private final String pool;
    private volatile int batch;
    private final ExecutorService thread;
    private final AtomicBoolean queued = new AtomicBoolean();
    private final AtomicInteger labelsSinceRound = new AtomicInteger();
    private final AtomicInteger roundsRun = new AtomicInteger();
    private final AtomicReference<RoundService.Outcome> last = new AtomicReference<>();
    private final StopSignal stop = new StopSignal();

    public RoundWorker(RoundService service, String pool, int batch) {
        if (batch < 1) {
            throw new IllegalArgumentException("batch must be at least 1, got " + batch);
        }
        this.service = service;
        this.pool = pool;
        this.batch = batch;
        this.thread = Executors.newSingleThreadExecutor(r -> {
            Thread t = new Thread(r, "dowser-rounds-" + pool);
            t.setDaemon(true);
            return t;
        });
    }

    /** Asks for a round: now, or right after the one running. */
    public void request() {
        if (queued.compareAndSet(false, true)) {
            thread.execute(() -> {
                queued.set(false);
                labelsSinceRound.set(0);
                if (!stop.requested()) {
                    last.set(service.run(pool, stop));
                }
                roundsRun.incrementAndGet();
            });
        }
    }

    /** Counts a new label; the {@code batch}-th since the last round starts the next. */
    public void labelAdded() {
        if (labelsSinceRound.incrementAndGet() >= batch) {
            labelsSinceRound.set(0);
            request();
        }
    }

    /** A label was taken back: it no longer counts toward the next round. */
    public void labelWithdrawn() {
        labelsSinceRound.updateAndGet(n -> Math.max(0, n - 1));
    }

    /** The pool's batch size changed: rounds now start after this many labels. */
    public void batchChanged(int newBatch) {
        if (newBatch < 1) {
            throw new IllegalArgumentException("batch must be at least 1, got " + newBatch);
        }
        batch = newBatch;
        if (labelsSinceRound.get() >= newBatch) {
            labelsSinceRound.set(0);
            request();
        }
    }

    public int roundsRun() {
        return roundsRun.get();
    }

    public RoundService.Outcome lastOutcome() {
        return last.get();
    }

    /** Labels still to come before the next round starts by itself. */
    public int labelsToNextRound() {
        return Math.max(0, batch - labelsSinceRound.get());
    }

    @Override
    public void close() {
        stop.request();
        thread.shutdown();
        try {
            if (!thread.awaitTermination(CLOSE_WAIT_SECONDS, TimeUnit.SECONDS)) {
                thread.shutdownNow();
            }
        } catch (InterruptedException e) {
            thread.shutdownNow();
            Thread.currentThread().interrupt();
        }
    }
}
