package dev.dowser.rounds;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.acquire.BatchBald;
import dev.dowser.acquire.ColdStart;
import dev.dowser.json.Json;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.stats.StabilisingPredictions;

/**
 * A pool's settings, kept as JSON with the pool in the names the API uses ({@link SettingsJson}); a
 * missing field takes its default.
 *
 * @param batchSize        records a round picks, and labels that start the next round
 * @param spotCheckShare   share of each queue drawn at random for honest accuracy estimates
 * @param leaseMinutes     how long a person holds a record before it returns to the queue
 * @param strategy         how a round picks
 * @param doubleLabelShare share of each queue sent to two different people, to measure their agreement
 * @param sampling         how many chains and draws each round keeps, and how long they warm up; null
 *                         while the pool follows the server's sampler
 * @param stopAgreement    the mean agreement (Cohen's kappa) of successive rounds' predictions on the
 *                         stop set at which they count as settled
 * @param coldStart        how the first batch, picked with no labels, is spread over the pool
 */
public record PoolSettings(int batchSize, double spotCheckShare, int leaseMinutes, Strategy strategy,
                           double doubleLabelShare, Sampling sampling, double stopAgreement,
                           ColdStart.Method coldStart) {

    public static final int DEFAULT_BATCH_SIZE = 10;
    public static final double DEFAULT_SPOT_CHECK_SHARE = 0.10;
    public static final int DEFAULT_LEASE_MINUTES = 10;
    public static final double DEFAULT_DOUBLE_LABEL_SHARE = 0.10;
    /**
     * What a new pool picks by; {@code default} names it in settings and on the command line.
     * {@code typiclust-mix}: TypiClust's typical records that the model is unsure of, the rest of
     * each batch by stochastic power sampling on BALD (Kirsch et al. 2023). Chosen on digits and
     * wine, confirmed on breast cancer, iris and the pumps (10 paired seeds): on digits 90% at 70
     * labels against power's 120 and random's 140, and a tie with power or better elsewhere
     * (DEVELOPERS.md, "the low-budget phase"). Power sampling alone was the default before; greedy
     * BALD trails random on digits at the cold temperature.
     */
    public static final Strategy DEFAULT_STRATEGY = Strategy.TYPICLUST_MIX;
    /**
     * The cold start's word, for the command line's default; the method follows from it. TypiClust
     * (Hacohen, Dekel & Weinshall 2022): its typical first batch lifted power's whole learning curve
     * on digits over k-means++'s outlying one (area +0.017, 10 of 10 paired seeds; 95% at 240 labels
     * against 290) and tied on wine, breast cancer and the pumps (-0.004, interval -0.008 to +0.001;
     * DEVELOPERS.md, "the cold start").
     */
    public static final String DEFAULT_COLD_START_WORD = "typiclust";
    public static final ColdStart.Method DEFAULT_COLD_START = ColdStart.Method.parse(DEFAULT_COLD_START_WORD);
    /** Agreement below this would call predictions settled while a tenth of them still change. */
    public static final double MIN_STOP_AGREEMENT = 0.9;
    /**
     * The mean agreement of the last 3 rounds' predictions at which they count as settled: stricter
     * than the published 0.99 (Bloodgood & Vijay-Shanker 2009). With the default sampler (64 draws
     * of a cold posterior) on digits, 10 seeds to 600 labels, 0.99 fired at a median of 390 labels
     * with test accuracy 1.0 point under the budget's (90% bootstrap interval over seeds 0.2 to
     * 1.3); 0.995 at 485 labels, 0.6 points under (0.2 to 0.6); confirmed on the demo's pumps and
     * breast cancer (DEVELOPERS.md, "when to stop"; {@code dowser bench --only stopping}).
     */
    public static final double DEFAULT_STOP_AGREEMENT = 0.995;

    /**
     * The pool's share of the sampler's settings: what an admin may change, each with its limits.
     *
     * @param chains        chains run side by side (each a thread while the round runs)
     * @param draws         draws kept in all, a multiple of the chains
     * @param reburnInSteps steps each chain takes from where the last round left it before drawing
     * @param temperature   the posterior's temperature T, sampling p^(1/T): 1 is the true posterior,
     *                      {@link SamplerConfig#COLD_POSTERIOR_TEMPERATURE} the default
     */
    public record Sampling(int chains, int draws, int reburnInSteps, double temperature) {

        public static final int MAX_CHAINS = 16;
        public static final int MAX_DRAWS = 512;
        public static final int MAX_REBURN_IN_STEPS = 10_000;
        /** Colder than this, the chains hardly move from one mode: a point estimate, not a posterior. */
        public static final double MIN_TEMPERATURE = 0.01;

        public Sampling {
            if (chains < 1 || chains > MAX_CHAINS) {
                throw new IllegalArgumentException("chains must be 1 to " + MAX_CHAINS + ", got " + chains);
            }
            if (draws < chains || draws > MAX_DRAWS || draws % chains != 0) {
                throw new IllegalArgumentException("draws must be a multiple of the chains (" + chains + ") from "
                        + chains + " to " + MAX_DRAWS + ", so every chain keeps as many; got " + draws);
            }
            if (reburnInSteps < 0 || reburnInSteps > MAX_REBURN_IN_STEPS) {
                throw new IllegalArgumentException("reburn_in_steps (warm-up steps each round) must be 0 to " + MAX_REBURN_IN_STEPS + ", got "
                        + reburnInSteps);
            }
            if (!(temperature >= MIN_TEMPERATURE && temperature <= SamplerConfig.TRUE_POSTERIOR_TEMPERATURE)) {
                throw new IllegalArgumentException("temperature must lie between " + MIN_TEMPERATURE + " and "
                        + SamplerConfig.TRUE_POSTERIOR_TEMPERATURE + " (1 samples the true posterior, "
                        + SamplerConfig.COLD_POSTERIOR_TEMPERATURE + " is the default cold posterior), got " + temperature);
            }
        }

        /** At the default temperature. */
        public Sampling(int chains, int draws, int reburnInSteps) {
            this(chains, draws, reburnInSteps, SamplerConfig.DEFAULT_TEMPERATURE);
        }

        /** The chains, draws, re-burn-in and temperature of a sampler. */
        public static Sampling of(SamplerConfig config) {
            return new Sampling(config.chains().count(), config.chains().draws(), config.steps().reburnInSteps(),
                    config.temperature());
        }

        /** The server's sampler with this pool's chains, draws, re-burn-in and temperature. */
        public SamplerConfig applyTo(SamplerConfig base) {
            return base.toBuilder().chains(chains, draws).reburnInSteps(reburnInSteps).temperature(temperature).build();
        }
    }

    public PoolSettings {
        if (batchSize < 1 || batchSize > 1_000) {
            throw new IllegalArgumentException("batch_size (labels per round) must be 1 to 1000, got " + batchSize);
        }
        if (!(spotCheckShare >= 0 && spotCheckShare <= 1)) {
            throw new IllegalArgumentException("spot_check_share must lie between 0 and 1, got " + spotCheckShare);
        }
        if (leaseMinutes < 1) {
            throw new IllegalArgumentException("lease_minutes must be at least 1, got " + leaseMinutes);
        }
        if (strategy == null) {
            throw new IllegalArgumentException("a strategy is required");
        }
        if (strategy == Strategy.BATCHBALD && batchSize > BatchBald.MAX_BATCH) {
            throw new IllegalArgumentException("batchbald picks at most " + BatchBald.MAX_BATCH
                    + " records a round (its joint entropy grows with the batch), got a batch size of " + batchSize
                    + "; lower the batch size or choose power, which scales to any batch");
        }
        if (!(doubleLabelShare >= 0 && doubleLabelShare <= 1)) {
            throw new IllegalArgumentException("double_label_share (the share sent to two people) must lie between 0 and 1, got " + doubleLabelShare);
        }
        if (coldStart == null) {
            throw new IllegalArgumentException("a cold start is required: kmeans++ or typiclust");
        }
        if (!(stopAgreement >= MIN_STOP_AGREEMENT && stopAgreement <= 1)) {
            throw new IllegalArgumentException("stop_agreement (the agreement at which predictions count as settled)"
                    + " must lie between "
                    + MIN_STOP_AGREEMENT + " and 1, got " + stopAgreement);
        }
    }

    /**
     * A change of some settings: a null field keeps its value. Naming any of chains, draws,
     * re-burn-in and temperature gives the pool its own sampling, the others taken from what is in force.
     */
    public record Change(Integer batchSize, Double spotCheckShare, Integer leaseMinutes, Strategy strategy,
                         Double doubleLabelShare, Integer chains, Integer draws, Integer reburnInSteps,
                         Double stopAgreement, Double temperature, ColdStart.Method coldStart) {

        /** A change as the API takes it, in the document's names; an unknown field or a wrong type is refused. */
        public static Change parse(JsonNode body) {
            return SettingsJson.readChange(body);
        }

        /** {@code now} with this change, checked whole; {@code server} is the sampler in force without the pool's own. */
        public PoolSettings applyTo(PoolSettings now, SamplerConfig server) {
            Sampling sampling = now.sampling(server);
            boolean ownSampling = chains != null || draws != null || reburnInSteps != null || temperature != null;
            return new PoolSettings(or(batchSize, now.batchSize()), or(spotCheckShare, now.spotCheckShare()),
                    or(leaseMinutes, now.leaseMinutes()), or(strategy, now.strategy()),
                    or(doubleLabelShare, now.doubleLabelShare()),
                    ownSampling ? new Sampling(or(chains, sampling.chains()), or(draws, sampling.draws()),
                            or(reburnInSteps, sampling.reburnInSteps()), or(temperature, sampling.temperature()))
                            : now.sampling(),
                    or(stopAgreement, now.stopAgreement()), or(coldStart, now.coldStart()));
        }

        private static <T> T or(T value, T kept) {
            return value == null ? kept : value;
        }
    }

    /** Settings that follow the server's sampler, with the default stopping rule. */
    public PoolSettings(int batchSize, double spotCheckShare, int leaseMinutes, Strategy strategy,
                        double doubleLabelShare) {
        this(batchSize, spotCheckShare, leaseMinutes, strategy, doubleLabelShare, null, DEFAULT_STOP_AGREEMENT);
    }

    /** Settings with the default cold start. */
    public PoolSettings(int batchSize, double spotCheckShare, int leaseMinutes, Strategy strategy,
                        double doubleLabelShare, Sampling sampling, double stopAgreement) {
        this(batchSize, spotCheckShare, leaseMinutes, strategy, doubleLabelShare, sampling, stopAgreement,
                DEFAULT_COLD_START);
    }

    /** The sampler a round of this pool runs: the server's, with the pool's own sampling where it has one. */
    public SamplerConfig sampler(SamplerConfig server) {
        return sampling == null ? server : sampling.applyTo(server);
    }

    /** The chains, draws, re-burn-in and temperature in force: the pool's own, else the server's. */
    public Sampling sampling(SamplerConfig server) {
        return sampling == null ? Sampling.of(server) : sampling;
    }

    /** The same settings with another batch size. */
    public PoolSettings withBatchSize(int size) {
        return new PoolSettings(size, spotCheckShare, leaseMinutes, strategy, doubleLabelShare, sampling,
                stopAgreement, coldStart);
    }

    /** The same settings with another share of spot checks. */
    public PoolSettings withSpotCheckShare(double share) {
        return new PoolSettings(batchSize, share, leaseMinutes, strategy, doubleLabelShare, sampling, stopAgreement,
                coldStart);
    }

    /** The same settings with another cold start. */
    public PoolSettings withColdStart(ColdStart.Method m) {
        return new PoolSettings(batchSize, spotCheckShare, leaseMinutes, strategy, doubleLabelShare, sampling,
                stopAgreement, m);
    }

    /** The same settings with another strategy. */
    public PoolSettings withStrategy(Strategy s) {
        return new PoolSettings(batchSize, spotCheckShare, leaseMinutes, s, doubleLabelShare, sampling, stopAgreement,
                coldStart);
    }

    /** The same settings with another agreement at which predictions count as settled. */
    public PoolSettings withStopAgreement(double k) {
        return new PoolSettings(batchSize, spotCheckShare, leaseMinutes, strategy, doubleLabelShare, sampling, k,
                coldStart);
    }

    /** The stopping rule of stabilising predictions with this pool's threshold. */
    public StabilisingPredictions stopRule() {
        return new StabilisingPredictions(StabilisingPredictions.DEFAULT_WINDOW, stopAgreement);
    }

    public static PoolSettings defaults() {
        return new PoolSettings(DEFAULT_BATCH_SIZE, DEFAULT_SPOT_CHECK_SHARE, DEFAULT_LEASE_MINUTES, DEFAULT_STRATEGY,
                DEFAULT_DOUBLE_LABEL_SHARE);
    }

    /** The settings kept as {@code json} (see {@link #toJson}); a missing field takes its default. */
    public static PoolSettings parse(String json) {
        return SettingsJson.read(json);
    }

    /** The document kept with the pool, with each round and in the history, in the API's names. */
    public String toJson() {
        return Json.write(SettingsJson.write(this, sampling));
    }

    /** The same document as the API shows it, with the chains, draws, re-burn-in and temperature in force. */
    public ObjectNode shown(Sampling inForce) {
        return SettingsJson.write(this, inForce);
    }
}
