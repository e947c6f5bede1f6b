package dev.dowser.rounds;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.acquire.BatchBald;
import dev.dowser.acquire.ColdStart;
import dev.dowser.json.Json;

/**
 * A pool's picking settings, kept as JSON with the pool; a missing field takes its default.
 *
 * @param batchSize       records a round picks, and labels that start the next round
 * @param spotCheckShare  share of each queue drawn at random for honest accuracy estimates
 * @param leaseMinutes    how long a person holds a record before it returns to the queue
 * @param strategy        how a round picks
 * @param doubleLabelShare share of each queue sent to two different people, to measure their agreement
 * @param coldStart       how the first batch, picked with no labels, is spread over the pool
 */
public record PoolSettings(int batchSize, double spotCheckShare, int leaseMinutes, Strategy strategy,
                           double doubleLabelShare, ColdStart.Method coldStart) {

    public static final int DEFAULT_BATCH_SIZE = 10;
    public static final double DEFAULT_SPOT_CHECK_SHARE = 0.10;
    public static final int DEFAULT_LEASE_MINUTES = 10;
    public static final double DEFAULT_DOUBLE_LABEL_SHARE = 0.10;
    /** What a new pool picks by; {@code default} names it in settings and on the command line. */
    public static final Strategy DEFAULT_STRATEGY = Strategy.BALD;
    public static final ColdStart.Method DEFAULT_COLD_START = ColdStart.Method.KMEANS_PLUS_PLUS;

    /** Settings with the default cold start. */
    public PoolSettings(int batchSize, double spotCheckShare, int leaseMinutes, Strategy strategy,
                        double doubleLabelShare) {
        this(batchSize, spotCheckShare, leaseMinutes, strategy, doubleLabelShare, DEFAULT_COLD_START);
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
        if (coldStart == null) {
            throw new IllegalArgumentException("a cold start is required: kmeans++ or typiclust");
        }
        if (strategy == Strategy.BATCHBALD && batchSize > BatchBald.MAX_BATCH) {
            throw new IllegalArgumentException("batchbald picks at most " + BatchBald.MAX_BATCH
                    + " records a round (its joint entropy grows with the batch), got a batch size of " + batchSize
                    + "; lower the batch size or choose power, which scales to any batch");
        }
        if (!(doubleLabelShare >= 0 && doubleLabelShare <= 1)) {
            throw new IllegalArgumentException("double_label_share (the share sent to two people) must lie between 0 and 1, got " + doubleLabelShare);
        }
    }

    /** The same settings with another batch size. */
    public PoolSettings withBatchSize(int size) {
        return new PoolSettings(size, spotCheckShare, leaseMinutes, strategy, doubleLabelShare, coldStart);
    }

    /** The same settings with another share of spot checks. */
    public PoolSettings withSpotCheckShare(double share) {
        return new PoolSettings(batchSize, share, leaseMinutes, strategy, doubleLabelShare, coldStart);
    }

    /** The same settings with another strategy. */
    public PoolSettings withStrategy(Strategy s) {
        return new PoolSettings(batchSize, spotCheckShare, leaseMinutes, s, doubleLabelShare, coldStart);
    }

    /** The same settings with another cold start. */
    public PoolSettings withColdStart(ColdStart.Method m) {
        return new PoolSettings(batchSize, spotCheckShare, leaseMinutes, strategy, doubleLabelShare, m);
    }

    public static PoolSettings defaults() {
        return new PoolSettings(DEFAULT_BATCH_SIZE, DEFAULT_SPOT_CHECK_SHARE, DEFAULT_LEASE_MINUTES, DEFAULT_STRATEGY,
                DEFAULT_DOUBLE_LABEL_SHARE);
    }

    public static PoolSettings parse(String json) {
        JsonNode n = Json.tree(json == null || json.isBlank() ? "{}" : json);
        PoolSettings d = defaults();
        return new PoolSettings(n.path("batchSize").asInt(d.batchSize()),
                n.path("spotCheckShare").asDouble(d.spotCheckShare()), n.path("leaseMinutes").asInt(d.leaseMinutes()),
                n.has("strategy") ? Strategy.parse(n.get("strategy").asText()) : d.strategy(),
                n.path("doubleLabelShare").asDouble(d.doubleLabelShare()),
                n.has("coldStart") ? ColdStart.Method.parse(n.get("coldStart").asText()) : d.coldStart());
    }

    /** The document kept with the pool, read back by {@link #parse}. */
    public String toJson() {
        return Json.write(Json.object().put("batchSize", batchSize).put("spotCheckShare", spotCheckShare)
                .put("leaseMinutes", leaseMinutes).put("strategy", strategy.word())
                .put("doubleLabelShare", doubleLabelShare).put("coldStart", coldStart.word()));
    }
}
