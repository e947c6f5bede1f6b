package dev.dowser.rounds;

import dev.dowser.acquire.PoolScorer;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.store.Database;
import java.time.Duration;
import java.util.HashMap;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.Executors;
import java.util.concurrent.ScheduledExecutorService;
import java.util.concurrent.TimeUnit;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Every pool's round worker, made when first needed and closed together on shutdown. Once the
 * server runs, {@link #watch} recovers from the way the last server ended and then looks every
 * {@link #WATCH_PERIOD} for pools with nothing served, however they were imported, and starts
 * their first round.
 */
public final class RoundWorkers implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(RoundWorkers.class);
    static final Duration WATCH_PERIOD = Duration.ofSeconds(2);

    private final Database db;
    private final SamplerConfig config;
    private final RoundService service;
    private final PoolScorer scorer;
    private final ConcurrentHashMap<String, RoundWorker> workers = new ConcurrentHashMap<>();
    private final ScheduledExecutorService watcher = Executors.newSingleThreadScheduledExecutor(r -> {
        Thread t = new Thread(r, "dowser-rounds-watch");
        t.setDaemon(true);
        return t;
    });

    public RoundWorkers(Database db, SamplerConfig config) {
        this(db, config, RoundEvents.NONE);
    }

    public RoundWorkers(Database db, SamplerConfig config, RoundEvents events) {
        this.db = db;
        this.config = config;
        this.scorer = PoolScorer.withAllCores();
        this.service = new RoundService(db, config, RoundService.DEFAULT_SEED, scorer, events);
    }

    /** The server's sampler: what a pool's rounds run unless its settings have their own sampling. */
    public SamplerConfig sampler() {
        return config;
    }

    /**
     * The pool's worker; the pool must exist. Its settings are read only when the worker is made:
     * the desk asks for the worker on every label, and later batch sizes reach it by
     * {@link RoundWorker#batchChanged}.
     */
    public RoundWorker worker(String pool) {
        return workers.computeIfAbsent(pool, p ->
                new RoundWorker(service, p, PoolSettings.parse(db.pools().require(p).settingsJson()).batchSize()));
    }

    /**
     * Changes a pool's settings in {@code actor}'s name (kept in the history) and tells its worker
     * the new batch size; returns them.
     */
    public PoolSettings changeSettings(String pool, PoolSettings next, String actor) {
        db.pools().updateSettings(db.pools().require(pool).id(), next.toJson(), actor);
        worker(pool).batchChanged(next.batchSize());
        return next;
    }

    /**
     * Recovers and starts watching. Rounds the last server left running (it was killed) are marked
     * interrupted; every pool with nothing served, or whose served batch is short (half or more of
     * it taken, or all but the low-water mark of one labeller) gets a round at once (a round stopped
     * at shutdown left its queue short too); from then on, a pool with nothing served
     * gets its first round within {@link #WATCH_PERIOD} of appearing.
     */
    public void watch() {
        int interrupted = db.rounds().interruptRunning();
        if (interrupted > 0) {
            LOG.info("{} round(s) left running by the last server were marked interrupted", interrupted);
        }
        serve(RoundWorker.LOW_WATER_PER_LABELLER);
        // The id index of each pool is built now, off the desk's path, rather than at the first label.
        watcher.execute(() -> db.pools().ids().values().forEach(db.records()::warmKeys));
        watcher.scheduleWithFixedDelay(this::serveNewPools, WATCH_PERIOD.toMillis(), WATCH_PERIOD.toMillis(),
                TimeUnit.MILLISECONDS);
    }

    private void serveNewPools() {
        try {
            serve(-1);
        } catch (RuntimeException e) {
            LOG.warn("cannot look for pools to serve", e);
        }
    }

    /**
     * Starts a round for every pool that {@link dev.dowser.store.QueueStore#poolsToServe} names
     * ({@code shortAt} as there), unless its worker started or ended a round while the store was
     * read: that round served the pool, and a second would start with its batch full.
     */
    private void serve(int shortAt) {
        Map<String, Integer> quiet = new HashMap<>();
        workers.forEach((pool, w) -> quiet.put(pool, w.quietAfter()));
        for (String pool : db.queues().poolsToServe(shortAt)) {
            // A worker made since has ended no round before it was looked at: 0, as a new one reports.
            worker(pool).requestIfStillQuiet(quiet.getOrDefault(pool, 0));
        }
    }

    /**
     * Stops looking for new pools to serve: from now on a pool gets rounds only when asked for, or
     * from its desk. For a long fuzz campaign, which makes thousands of pools and tests the server's
     * edge, not their rounds.
     */
    public void stopWatching() {
        watcher.shutdownNow();
    }

    @Override
    public void close() {
        watcher.shutdownNow();
        workers.values().forEach(RoundWorker::close);
        scorer.close();
    }
}
