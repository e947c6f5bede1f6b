package dev.dowser.store;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Timestamp;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.Set;
import javax.sql.DataSource;

/**
 * Prepare, bind, run and map in one call: how the store talks to the database. Arguments bind by
 * their type (null as SQL NULL, an {@link Instant} as a timestamp). On a data source each call
 * takes a connection of its own, or one transaction; a failure becomes a {@link StoreException}
 * that says what could not be done. The static forms work on a connection the caller holds, inside
 * a transaction.
 */
final class Sql {

    /** Maps the current row of a result. */
    @FunctionalInterface
    interface Row<T> {
        T map(ResultSet rs) throws SQLException;
    }

    /** Work on one connection. */
    @FunctionalInterface
    interface Work<T> {
        T run(Connection c) throws SQLException;
    }

    /**
     * SQLSTATEs of a lock not granted in time: H2's lock timeout (HYT00), a serialisation failure
     * or deadlock victim (40001, 40P01), PostgreSQL's lock not available (55P03).
     */
    private static final Set<String> BUSY = Set.of("HYT00", "40001", "40P01", "55P03");

    private final DataSource ds;

    Sql(DataSource ds) {
        this.ds = ds;
    }

    /** Every row of a query; {@code what} completes "cannot ..." in the error. */
    <T> List<T> list(String what, String sql, Row<T> row, Object... args) {
        return connected(what, c -> list(c, sql, row, args));
    }

    /** The first row of a query, if any. */
    <T> Optional<T> first(String what, String sql, Row<T> row, Object... args) {
        return connected(what, c -> first(c, sql, row, args));
    }

    /** Runs an insert, update or delete; the rows it changed. */
    int update(String what, String sql, Object... args) {
        return connected(what, c -> update(c, sql, args));
    }

    /** Reads a whole result as it streams, {@code fetchRows} rows from the database at a time. */
    @FunctionalInterface
    interface Scan<T> {
        T read(ResultSet rs) throws SQLException;
    }

    /**
     * Runs a query and hands its result to {@code scan} as it streams: for results too large to
     * hold as a list (every label of a pool), read in order while the connection is held.
     */
    <T> T scan(String what, String sql, int fetchRows, Scan<T> scan, Object... args) {
        return connected(what, c -> scan(c, sql, fetchRows, scan, args));
    }

    static <T> T scan(Connection c, String sql, int fetchRows, Scan<T> scan, Object... args) throws SQLException {
        try (PreparedStatement p = c.prepareStatement(sql)) {
            p.setFetchSize(fetchRows);
            bind(p, args);
            try (ResultSet rs = p.executeQuery()) {
                return scan.read(rs);
            }
        }
    }

    /** Runs {@code work} on one connection. */
    <T> T connected(String what, Work<T> work) {
        try (Connection c = ds.getConnection()) {
            return work.run(c);
        } catch (SQLException e) {
            throw failure(what, e);
        }
    }

    /** Runs {@code work} as one transaction: committed if it returns, rolled back if it throws. */
    <T> T transaction(String what, Work<T> work) {
        try (Connection c = ds.getConnection()) {
            c.setAutoCommit(false);
            try {
                T result = work.run(c);
                c.commit();
                return result;
            } catch (SQLException | RuntimeException e) {
                c.rollback();
                throw e;
            } finally {
                c.setAutoCommit(true);
            }
        } catch (SQLException e) {
            throw failure(what, e);
        }
    }

    /** What a failed statement becomes: busy (try again) when a lock was not granted in time, else a store failure. */
    static StoreException failure(String what, SQLException e) {
        for (Throwable t = e; t != null; t = t.getCause()) {
            if (t instanceof SQLException s && s.getSQLState() != null && BUSY.contains(s.getSQLState())) {
                return new BusyException(what, e);
            }
        }
        return new StoreException("cannot " + what + ": " + e.getMessage(), e);
    }

    static <T> List<T> list(Connection c, String sql, Row<T> row, Object... args) throws SQLException {
        try (PreparedStatement p = c.prepareStatement(sql)) {
            bind(p, args);
            try (ResultSet rs = p.executeQuery()) {
                List<T> out = new ArrayList<>();
                while (rs.next()) {
                    out.add(row.map(rs));
                }
                return out;
            }
        }
    }

    static <T> Optional<T> first(Connection c, String sql, Row<T> row, Object... args) throws SQLException {
        try (PreparedStatement p = c.prepareStatement(sql)) {
            bind(p, args);
            p.setMaxRows(1);
            try (ResultSet rs = p.executeQuery()) {
                return rs.next() ? Optional.ofNullable(row.map(rs)) : Optional.empty();
            }
        }
    }

    static int update(Connection c, String sql, Object... args) throws SQLException {
        try (PreparedStatement p = c.prepareStatement(sql)) {
            bind(p, args);
            return p.executeUpdate();
        }
    }

    /** Runs an insert; the value the database generated for column {@code key} of the new row. */
    static long insert(Connection c, String sql, String key, Object... args) throws SQLException {
        try (PreparedStatement p = c.prepareStatement(sql, new String[] {key})) {
            bind(p, args);
            p.executeUpdate();
            try (ResultSet keys = p.getGeneratedKeys()) {
                if (!keys.next()) {
                    throw new SQLException("the database made no " + key + " for the new row");
                }
                return keys.getLong(1);
            }
        }
    }

    /** Runs one statement for each argument list, sent to the database together. */
    static void batch(Connection c, String sql, List<Object[]> rows) throws SQLException {
        if (rows.isEmpty()) {
            return;
        }
        try (PreparedStatement p = c.prepareStatement(sql)) {
            for (Object[] args : rows) {
                bind(p, args);
                p.addBatch();
            }
            p.executeBatch();
        }
    }

    static void bind(PreparedStatement p, Object... args) throws SQLException {
        for (int i = 0; i < args.length; i++) {
            Object a = args[i];
            if (a instanceof Instant t) {
                p.setTimestamp(i + 1, Timestamp.from(t));
            } else {
                p.setObject(i + 1, a);
            }
        }
    }

    /** A timestamp column as an instant, or null. */
    static Instant instant(ResultSet rs, int column) throws SQLException {
        Timestamp t = rs.getTimestamp(column);
        return t == null ? null : t.toInstant();
    }

    /** A nullable whole-number column. */
    static Integer nullableInt(ResultSet rs, int column) throws SQLException {
        int v = rs.getInt(column);
        return rs.wasNull() ? null : v;
    }

    /** A nullable whole-number column of 64 bits. */
    static Long nullableLong(ResultSet rs, int column) throws SQLException {
        long v = rs.getLong(column);
        return rs.wasNull() ? null : v;
    }

    /** A nullable number column. */
    static Double nullableDouble(ResultSet rs, int column) throws SQLException {
        double v = rs.getDouble(column);
        return rs.wasNull() ? null : v;
    }
}
