package dev.dowser.store;

import dev.dowser.json.Json;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Clock;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import javax.sql.DataSource;

/** Reads pools and their label counts. Pools are written by {@link PoolWriter}. */
public final class PoolStore {

    private static final String COLUMNS =
            "id, name, label_set, column_roles, feature_schema, settings, record_count, created_at";

    private final DataSource ds;
    private final LabelStore labels;
    private final Clock clock;

    PoolStore(DataSource ds, LabelStore labels, Clock clock) {
        this.ds = ds;
        this.labels = labels;
        this.clock = clock;
    }

    public Optional<PoolRow> find(String name) {
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT " + COLUMNS + " FROM pools WHERE name = ?")) {
            q.setString(1, name);
            try (ResultSet rs = q.executeQuery()) {
                return rs.next() ? Optional.of(row(rs)) : Optional.empty();
            }
        } catch (SQLException e) {
            throw new StoreException("cannot read pool '" + name + "': " + e.getMessage(), e);
        }
    }

    public PoolRow require(String name) {
        return find(name).orElseThrow(() -> new NotFoundException("no pool named '" + name + "'"));
    }

    /** Replaces the pool's settings document (validated by the caller). */
    /** Replaces a pool's settings and appends the change, before and after, to the history; both or neither. */
    public void updateSettings(long poolId, String settingsJson, String actor) {
        try {
            Transactions.run(ds, c -> {
                String before;
                try (PreparedStatement q = c.prepareStatement("SELECT settings FROM pools WHERE id = ? FOR UPDATE")) {
                    q.setLong(1, poolId);
                    try (ResultSet rs = q.executeQuery()) {
                        if (!rs.next()) {
                            throw new NotFoundException("no pool with id " + poolId);
                        }
                        before = rs.getString(1);
                    }
                }
                try (PreparedStatement u = c.prepareStatement("UPDATE pools SET settings = ? WHERE id = ?")) {
                    u.setString(1, settingsJson);
                    u.setLong(2, poolId);
                    u.executeUpdate();
                }
                HistoryStore.append(c, clock, poolId, "settings", "settings-changed", actor, before, settingsJson);
                return null;
            });
        } catch (SQLException e) {
            throw new StoreException("cannot save the settings of pool " + poolId + ": " + e.getMessage(), e);
        }
    }

    /** Every pool's name and id, by name. */
    public Map<String, Long> ids() {
        Map<String, Long> out = new LinkedHashMap<>();
        new Sql(ds).list("list pools", "SELECT name, id FROM pools ORDER BY name",
                rs -> out.put(rs.getString(1), rs.getLong(2)));
        return out;
    }

    public List<PoolSummary> list() {
        List<PoolRow> pools = new ArrayList<>();
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT " + COLUMNS + " FROM pools ORDER BY name");
             ResultSet rs = q.executeQuery()) {
            while (rs.next()) {
                pools.add(row(rs));
            }
        } catch (SQLException e) {
            throw new StoreException("cannot list pools: " + e.getMessage(), e);
        }
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
                rs.getString(6), rs.getLong(7), rs.getTimestamp(8).toInstant());
    }
}
