package dev.dowser.store;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Timestamp;
import java.time.Clock;
import java.util.ArrayList;
import java.util.List;
import javax.sql.DataSource;

/** The record of rounds: when each ran, how it ended, with which kernel, and the chains' health. */
public final class RoundStore {

    /** One round as stored. */
    public record RoundRow(int round, String status, java.time.Instant startedAt, java.time.Instant finishedAt,
                           long labelsAtStart, String kernel, String message, String healthJson) {
    }

    private final DataSource ds;
    private final Clock clock;

    RoundStore(DataSource ds, Clock clock) {
        this.ds = ds;
        this.clock = clock;
    }

    /** Records the start of the pool's next round and returns its number (1, 2, ...). */
    public int start(long poolId, long labels) {
        try {
            return Transactions.run(ds, c -> {
                try (PreparedStatement max = c.prepareStatement(
                             "SELECT COALESCE(MAX(round_no), 0) FROM rounds WHERE pool_id = ?");
                     PreparedStatement ins = c.prepareStatement("INSERT INTO rounds (pool_id, round_no, status,"
                             + " started_at, labels_at_start) VALUES (?, ?, 'running', ?, ?)")) {
                    max.setLong(1, poolId);
                    int round;
                    try (ResultSet rs = max.executeQuery()) {
                        rs.next();
                        round = rs.getInt(1) + 1;
                    }
                    ins.setLong(1, poolId);
                    ins.setInt(2, round);
                    ins.setTimestamp(3, Timestamp.from(clock.instant()));
                    ins.setLong(4, labels);
                    ins.executeUpdate();
                    return round;
                }
            });
        } catch (SQLException e) {
            throw new StoreException("cannot start a round of pool " + poolId + ": " + e.getMessage(), e);
        }
    }

    public void finish(long poolId, int round, String kernel, String message, String healthJson) {
        end(poolId, round, "published", kernel, message, healthJson);
    }

    public void fail(long poolId, int round, String message) {
        end(poolId, round, "failed", null, message, null);
    }

    /** The round was stopped at a safe point (the server shut down); its chains were saved, its queue not published. */
    public void stop(long poolId, int round, String kernel, String message) {
        end(poolId, round, "stopped", kernel, message, null);
    }

    private void end(long poolId, int round, String status, String kernel, String message, String healthJson) {
        try (Connection c = ds.getConnection();
             PreparedStatement u = c.prepareStatement("UPDATE rounds SET status = ?, finished_at = ?, kernel = ?,"
                     + " message = ?, health = ? WHERE pool_id = ? AND round_no = ?")) {
            u.setString(1, status);
            u.setTimestamp(2, Timestamp.from(clock.instant()));
            u.setString(3, kernel);
            u.setString(4, message);
            u.setString(5, healthJson);
            u.setLong(6, poolId);
            u.setInt(7, round);
            u.executeUpdate();
        } catch (SQLException e) {
            throw new StoreException("cannot record the end of round " + round + ": " + e.getMessage(), e);
        }
    }

    /** The pool's rounds, newest first. */
    public List<RoundRow> list(long poolId) {
        List<RoundRow> out = new ArrayList<>();
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT round_no, status, started_at, finished_at,"
                     + " labels_at_start, kernel, message, health FROM rounds WHERE pool_id = ? ORDER BY round_no DESC")) {
            q.setLong(1, poolId);
            try (ResultSet rs = q.executeQuery()) {
                while (rs.next()) {
                    Timestamp done = rs.getTimestamp(4);
                    out.add(new RoundRow(rs.getInt(1), rs.getString(2), rs.getTimestamp(3).toInstant(),
                            done == null ? null : done.toInstant(), rs.getLong(5), rs.getString(6), rs.getString(7),
                            rs.getString(8)));
                }
            }
        } catch (SQLException e) {
            throw new StoreException("cannot list the rounds of pool " + poolId + ": " + e.getMessage(), e);
        }
        return out;
    }
}
