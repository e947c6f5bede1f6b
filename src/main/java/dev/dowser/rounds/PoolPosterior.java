package dev.dowser.rounds;

import dev.dowser.data.FeatureMatrix;
import dev.dowser.data.LabelledSet;
import dev.dowser.model.Architecture;
import dev.dowser.sampler.PosteriorSampler;
import dev.dowser.sampler.Sample;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.sampler.SamplingStopped;
import dev.dowser.sampler.State;
import dev.dowser.sampler.StopSignal;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import dev.dowser.store.SavedChain;
import java.util.List;

/**
 * Samples a pool's posterior from its current labels and keeps the chains: each round continues
 * the chains from where the last one stopped (a warm start), also across restarts, since the
 * chains' last states are saved in the database after every round.
 */
public final class PoolPosterior {

    private final Database db;
    private final SamplerConfig config;

    public PoolPosterior(Database db, SamplerConfig config) {
        this.db = db;
        this.config = config;
    }

    /** One round on the pool's labelled records; {@code probe} rows (standardised) serve the diagnostics. */
    public Sample sampleRound(String poolName, FeatureMatrix matrix, float[] probe) {
        return sampleRound(poolName, matrix, probe, StopSignal.never());
    }

    /**
     * As above; stopped early by {@code stop}, the chains' states are saved all the same (the next
     * round continues from them) and {@link SamplingStopped} is thrown on.
     */
    public Sample sampleRound(String poolName, FeatureMatrix matrix, float[] probe, StopSignal stop) {
        PoolRow pool = db.pools().require(poolName);
        LabelledSet labelled = LabelledSet.of(db, poolName, matrix);
        if (labelled.rows() == 0) {
            throw new IllegalStateException("pool '" + poolName + "' has no labels yet; label a first batch");
        }
        PosteriorSampler sampler = new PosteriorSampler(config);
        Architecture arch = sampler.layout(matrix.cols(), pool.classes().size()).architecture();
        List<SavedChain> saved = db.chains().load(pool.id());
        List<State> previous = ChainStates.continuable(saved, arch, config.chains());
        int round = saved.isEmpty() ? 0 : saved.get(0).round() + 1;
        Sample sample;
        try {
            sample = sampler.sample(labelled.x(), labelled.labels(), pool.classes().size(), previous, probe, round,
                    stop);
        } catch (SamplingStopped stopped) {
            db.chains().save(pool.id(), ChainStates.toSaved(stopped.lastStates(),
                    stopped.choice().kernel().word(), arch, round));
            throw stopped;
        }
        db.chains().save(pool.id(), ChainStates.toSaved(sample, round));
        return sample;
    }
}
