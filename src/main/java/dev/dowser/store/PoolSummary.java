package dev.dowser.store;

import java.time.Instant;
import java.util.Map;

/** A pool as listed: its size and how many of its records carry a label, per class in label-set order. */
public record PoolSummary(String name, long recordCount, long labelledCount, Map<String, Long> labelCounts,
                          Instant createdAt) {

    public PoolSummary {
        labelCounts = java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(labelCounts));
    }
}
