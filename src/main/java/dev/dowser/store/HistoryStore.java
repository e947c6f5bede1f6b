package dev.dowser.store;

import java.sql.Connection;
import java.sql.SQLException;
import java.time.Clock;
import java.time.Instant;
import java.util.List;

/** The append-only record of changes to settings and accounts: rows are added, never changed or removed. */
public final class HistoryStore {

    public static final int MAX_VALUE_CHARS = 4_000;

    /** One change: {@code poolId} is null for changes outside a pool (accounts). */
    public record Change(long id, Long poolId, String subject, String kind, String actor, Instant at,
                         String before, String after) {
    }

    private final Sql sql;
    private final Clock clock;

    HistoryStore(Sql sql, Clock clock) {
        this.sql = sql;
        this.clock = clock;
    }

    public void append(Long poolId, String subject, String kind, String actor, String before, String after) {
        sql.connected("record the change of " + subject, c -> {
            append(c, clock, poolId, subject, kind, actor, before, after);
            return null;
        });
    }

    /** Appends on {@code c}, so that a change and its history entry share one transaction. */
    static void append(Connection c, Clock clock, Long poolId, String subject, String kind, String actor,
                       String before, String after) throws SQLException {
        Sql.update(c, "INSERT INTO history (pool_id, subject, change_kind, actor, changed_at, before_value,"
                + " after_value) VALUES (?, ?, ?, ?, ?, ?, ?)", poolId, subject, kind, actor, clock.instant(),
                clip(before), clip(after));
    }

    /** Changes about {@code subject} (within {@code poolId} when given), oldest first. */
    public List<Change> of(Long poolId, String subject) {
        String where = poolId == null ? "pool_id IS NULL AND subject = ?" : "pool_id = ? AND subject = ?";
        Object[] args = poolId == null ? new Object[] {subject} : new Object[] {poolId, subject};
        return sql.list("read the history of " + subject, "SELECT id, pool_id, subject, change_kind, actor, changed_at,"
                + " before_value, after_value FROM history WHERE " + where + " ORDER BY id",
                rs -> new Change(rs.getLong(1), Sql.nullableLong(rs, 2), rs.getString(3), rs.getString(4),
                        rs.getString(5), Sql.instant(rs, 6), rs.getString(7), rs.getString(8)), args);
    }

    private static String clip(String value) {
        return value == null || value.length() <= MAX_VALUE_CHARS ? value : value.substring(0, MAX_VALUE_CHARS);
    }
}
