package dev.dowser.rounds;

import dev.dowser.acquire.PoolScorer;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.store.Database;
import java.util.concurrent.ConcurrentHashMap;

/** Every pool's round worker, made when first needed and closed together on shutdown. */
public final class RoundWorkers implements AutoCloseable {

    private final Database db;
    private final SamplerConfig config;
    private final RoundService service;
    private final PoolScorer scorer;
    private final ConcurrentHashMap<String, RoundWorker> workers = new ConcurrentHashMap<>();

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

    @Override
    public void close() {
        workers.values().forEach(RoundWorker::close);
        scorer.close();
    }
}
