package dev.dowser.store;

import dev.dowser.json.Json;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Clock;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/** Reads pools and their label counts. Pools are written by {@link PoolWriter}. */
public final class PoolStore {

    private static final String COLUMNS =
            "id, name, label_set, column_roles, feature_schema, settings, record_count, created_at";

    private final Sql sql;
    private final LabelStore labels;
    private final Clock clock;

    PoolStore(Sql sql, LabelStore labels, Clock clock) {
        this.sql = sql;
        this.labels = labels;
        this.clock = clock;
    }

    public Optional<PoolRow> find(String name) {
        return sql.first("read pool '" + name + "'", "SELECT " + COLUMNS + " FROM pools WHERE name = ?", PoolStore::row,
                name);
    }

    public PoolRow require(String name) {
        return find(name).orElseThrow(() -> new NotFoundException("no pool named '" + name + "'"));
    }

    /** Replaces a pool's settings (validated by the caller) and appends the change, before and after, to the history; both or neither. */
    public void updateSettings(long poolId, String settingsJson, String actor) {
        sql.transaction("save the settings of pool " + poolId, c -> {
            String before = Sql.first(c, "SELECT settings FROM pools WHERE id = ? FOR UPDATE", rs -> rs.getString(1),
                    poolId).orElseThrow(() -> new NotFoundException("no pool with id " + poolId));
            Sql.update(c, "UPDATE pools SET settings = ? WHERE id = ?", settingsJson, poolId);
            HistoryStore.append(c, clock, poolId, "settings", "settings-changed", actor, before, settingsJson);
            return null;
        });
    }

    /** Every pool's name and id, by name. */
    public Map<String, Long> ids() {
        Map<String, Long> out = new LinkedHashMap<>();
        sql.list("list pools", "SELECT name, id FROM pools ORDER BY name", rs -> out.put(rs.getString(1), rs.getLong(2)));
        return out;
    }

    public List<PoolSummary> list() {
        List<PoolRow> pools = sql.list("list pools", "SELECT " + COLUMNS + " FROM pools ORDER BY name", PoolStore::row);
        List<PoolSummary> out = new ArrayList<>();
        for (PoolRow pool : pools) {
            Map<String, Long> counts = labelCounts(pool);
            long labelled = counts.values().stream().mapToLong(Long::longValue).sum();
            out.add(new PoolSummary(pool.name(), pool.recordCount(), labelled, counts, pool.createdAt()));
        }
        return out;
    }

    /** Records per current label, in label-set order, classes with none included. */
    public Map<String, Long> labelCounts(PoolRow pool) {
        Map<String, Long> counts = new LinkedHashMap<>();
        for (String cls : pool.classes()) {
            counts.put(cls, 0L);
        }
        labels.counts(pool.id()).forEach((label, n) -> counts.merge(label, n, Long::sum));
        return counts;
    }

    private static PoolRow row(ResultSet rs) throws SQLException {
        List<String> classes = Arrays.asList(Json.read(rs.getString(3), String[].class));
        return new PoolRow(rs.getLong(1), rs.getString(2), classes, rs.getString(4), rs.getString(5),
                rs.getString(6), rs.getLong(7), Sql.instant(rs, 8));
    }
}
