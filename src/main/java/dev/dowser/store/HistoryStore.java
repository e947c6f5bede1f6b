package dev.dowser.store;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Timestamp;
import java.sql.Types;
import java.time.Clock;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import javax.sql.DataSource;

/** The append-only record of changes to settings and accounts: rows are added, never changed or removed. */
public final class HistoryStore {

    public static final int MAX_VALUE_CHARS = 4_000;

    /** One change: {@code poolId} is null for changes outside a pool (accounts). */
    public record Change(long id, Long poolId, String subject, String kind, String actor, Instant at,
                         String before, String after) {
    }

    private final DataSource ds;
    private final Clock clock;

    HistoryStore(DataSource ds, Clock clock) {
        this.ds = ds;
        this.clock = clock;
    }

    public void append(Long poolId, String subject, String kind, String actor, String before, String after) {
        try (Connection c = ds.getConnection()) {
            append(c, clock, poolId, subject, kind, actor, before, after);
        } catch (SQLException e) {
            throw new StoreException("cannot record the change of " + subject + ": " + e.getMessage(), e);
        }
    }

    /** Appends on {@code c}, so that a change and its history entry share one transaction. */
    static void append(Connection c, Clock clock, Long poolId, String subject, String kind, String actor,
                       String before, String after) throws SQLException {
        try (PreparedStatement p = c.prepareStatement("INSERT INTO history (pool_id, subject, change_kind, actor,"
                + " changed_at, before_value, after_value) VALUES (?, ?, ?, ?, ?, ?, ?)")) {
            if (poolId == null) {
                p.setNull(1, Types.BIGINT);
            } else {
                p.setLong(1, poolId);
            }
            p.setString(2, subject);
            p.setString(3, kind);
            p.setString(4, actor);
            p.setTimestamp(5, Timestamp.from(clock.instant()));
            p.setString(6, clip(before));
            p.setString(7, clip(after));
            p.executeUpdate();
        }
    }

    /** Changes about {@code subject} (within {@code poolId} when given), oldest first. */
    public List<Change> of(Long poolId, String subject) {
        List<Change> out = new ArrayList<>();
        String where = poolId == null ? "pool_id IS NULL" : "pool_id = ?";
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT id, pool_id, subject, change_kind, actor, changed_at,"
                     + " before_value, after_value FROM history WHERE " + where + " AND subject = ? ORDER BY id")) {
            int i = 1;
            if (poolId != null) {
                q.setLong(i++, poolId);
            }
            q.setString(i, subject);
            try (ResultSet rs = q.executeQuery()) {
                while (rs.next()) {
                    long pool = rs.getLong(2);
                    out.add(new Change(rs.getLong(1), rs.wasNull() ? null : pool, rs.getString(3), rs.getString(4),
                            rs.getString(5), rs.getTimestamp(6).toInstant(), rs.getString(7), rs.getString(8)));
                }
            }
            return out;
        } catch (SQLException e) {
            throw new StoreException("cannot read the history of " + subject + ": " + e.getMessage(), e);
        }
    }

    private static String clip(String value) {
        return value == null || value.length() <= MAX_VALUE_CHARS ? value : value.substring(0, MAX_VALUE_CHARS);
    }
}
