package dev.dowser.rounds;

import dev.dowser.sampler.StopSignal;
import dev.dowser.store.RoundStatus;
import java.time.Duration;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.atomic.AtomicReference;

/**
 * A pool's background worker: runs a round on request, by itself after every {@code batch} new
 * labels, and before the served batch runs out. Labelling never waits for it: people keep taking
 * records from the queue being served (its batch, then its reserve of next-best records) while the
 * next is computed. Requests that arrive during a round fold into one more round after it. Closing
 * stops a running round at its chains' next safe point (their states are saved, the served queue
 * stays) and starts no more.
 *
 * <p>The low-water mark: once no more than {@value #LOW_WATER_PER_LABELLER} open places of the
 * batch remain per person active at the desk (one who asked for a record or labelled within
 * {@link #ACTIVE_WINDOW}), the next round starts, unless one is running or waiting already. A team
 * of one starts the next round while on the second-last record; a team of twenty, at forty.
 */
public final class RoundWorker implements AutoCloseable {

    static final long CLOSE_WAIT_SECONDS = 120;
    static final int LOW_WATER_PER_LABELLER = 2;
    /** Someone who asked for a record or labelled within this long counts as at the desk. */
    static final Duration ACTIVE_WINDOW = Duration.ofMinutes(2);
    /** After a round fails, the desk does not start another by itself for this long (a person still can). */
    static final Duration RETRY_AFTER_FAILURE = Duration.ofMinutes(1);

    private final RoundService service;
    private final String pool;
    private volatile int batch;
    private final ExecutorService thread;
    private final AtomicBoolean queued = new AtomicBoolean();
    private final AtomicBoolean running = new AtomicBoolean();
    private final AtomicInteger labelsSinceRound = new AtomicInteger();
    private final AtomicInteger roundsRun = new AtomicInteger();
    private final AtomicReference<RoundService.Outcome> last = new AtomicReference<>();
    private final AtomicLong failedAt = new AtomicLong(System.nanoTime() - RETRY_AFTER_FAILURE.toNanos() - 1);
    private final ConcurrentHashMap<String, Long> seen = new ConcurrentHashMap<>();
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

    /**
     * Asks for a round: now, or right after the one running. A round's start and end change the
     * worker's state under its lock, so that {@link #requestIfStillQuiet} can tell whether one
     * started or ended since {@link #quietAfter}.
     */
    public synchronized void request() {
        if (queued.compareAndSet(false, true)) {
            thread.execute(() -> {
                synchronized (this) {
                    // Running before no longer queued, so that busy() is never false in between.
                    running.set(true);
                    queued.set(false);
                }
                labelsSinceRound.set(0);
                try {
                    if (!stop.requested()) {
                        RoundService.Outcome outcome = service.run(pool, stop);
                        last.set(outcome);
                        if (outcome.status() == RoundStatus.FAILED) {
                            failedAt.set(System.nanoTime());
                        }
                    }
                } finally {
                    synchronized (this) {
                        // Counted before no longer running, so that a quiet worker's count covers every round that ended.
                        roundsRun.incrementAndGet();
                        running.set(false);
                    }
                }
            });
        }
    }

    /** Asks for a round unless one is running or waiting, or the last failed within {@link #RETRY_AFTER_FAILURE}. */
    public synchronized void requestUnlessFailing() {
        if (!busy() && System.nanoTime() - failedAt.get() > RETRY_AFTER_FAILURE.toNanos()) {
            request();
        }
    }

    /**
     * The rounds this worker has ended so far, or -1 while one runs or waits: taken before reading
     * from the store whether the pool needs a round, and handed to {@link #requestIfStillQuiet}.
     */
    public synchronized int quietAfter() {
        return busy() ? -1 : roundsRun.get();
    }

    /**
     * Asks for a round as {@link #requestUnlessFailing} does, but only if no round has waited, run
     * or ended since {@link #quietAfter} gave {@code seen}: only a round publishes a queue, so what
     * the caller read from the store in between still holds. Without this, a look at the store
     * taken while a round ran ("nothing served") would start another round right after that round
     * had served a full batch.
     */
    public synchronized void requestIfStillQuiet(int seen) {
        if (seen >= 0 && seen == roundsRun.get()) {
            requestUnlessFailing();
        }
    }

    /** A round is running, or asked for and about to. */
    public boolean busy() {
        return queued.get() || running.get();
    }

    /** Counts a new label; the {@code batch}-th since the last round starts the next. */
    public void labelAdded() {
        if (labelsSinceRound.incrementAndGet() >= batch) {
            labelsSinceRound.set(0);
            request();
        }
    }

    /**
     * {@code person} is at the desk, and {@code openInBatch} places of the served batch are still
     * free for anyone: at the low-water mark, the next round starts (see the class comment). With
     * nothing served at all, the first round does. {@code quietSince} is {@link #quietAfter} as it
     * was before the caller read {@code openInBatch}: a round that published in between made the
     * count stale, and asks nothing (see {@link #requestIfStillQuiet}).
     */
    public void deskActive(String person, int quietSince, int openInBatch) {
        seen.put(person, System.nanoTime());
        if (openInBatch <= LOW_WATER_PER_LABELLER * activeLabellers()) {
            requestIfStillQuiet(quietSince);
        }
    }

    /** People who asked for a record or labelled within {@link #ACTIVE_WINDOW}. */
    public int activeLabellers() {
        long since = System.nanoTime() - ACTIVE_WINDOW.toNanos();
        seen.values().removeIf(t -> t - since < 0);
        return Math.max(1, seen.size());
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
