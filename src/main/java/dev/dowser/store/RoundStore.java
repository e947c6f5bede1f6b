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
                           long labelsAtStart, String kernel, String message, String healthJson, String samplerJson) {
    }

    /**
     * What a round was computed from, kept so that its queue can be rebuilt.
     *
     * @param seed         the round's node of the pool's seed tree
     * @param samplerJson  the sampler's configuration
     * @param settingsJson the pool's settings
     * @param lastLabelId  the newest label row the round read (0 when there were none)
     * @param chainsFrom   the round whose chain states it continued; null when they started afresh
     */
    public record Inputs(long seed, String samplerJson, String settingsJson, long lastLabelId, Integer chainsFrom) {
    }

    private final DataSource ds;
    private final Clock clock;

    RoundStore(DataSource ds, Clock clock) {
        this.ds = ds;
        this.clock = clock;
    }

    /** The number the pool's next round will have (1, 2, ...), unless another starts first. */
    public int next(long poolId) {
        try (Connection c = ds.getConnection();
             PreparedStatement max = c.prepareStatement("SELECT COALESCE(MAX(round_no), 0) FROM rounds WHERE pool_id = ?")) {
            max.setLong(1, poolId);
            try (ResultSet rs = max.executeQuery()) {
                rs.next();
                return rs.getInt(1) + 1;
            }
        } catch (SQLException e) {
            throw new StoreException("cannot read the rounds of pool " + poolId + ": " + e.getMessage(), e);
        }
    }

    /**
     * Records the start of round {@code round} of the pool with what it is computed from; refused
     * when that number is taken (another round started first).
     */
    public void start(long poolId, int round, long labels, Inputs inputs) {
        try (Connection c = ds.getConnection();
             PreparedStatement ins = c.prepareStatement("INSERT INTO rounds (pool_id, round_no, status, started_at,"
                     + " labels_at_start, seed, sampler, settings, last_label_id, chains_from)"
                     + " VALUES (?, ?, 'running', ?, ?, ?, ?, ?, ?, ?)")) {
            ins.setLong(1, poolId);
            ins.setInt(2, round);
            ins.setTimestamp(3, Timestamp.from(clock.instant()));
            ins.setLong(4, labels);
            ins.setLong(5, inputs.seed());
            ins.setString(6, inputs.samplerJson());
            ins.setString(7, inputs.settingsJson());
            ins.setLong(8, inputs.lastLabelId());
            if (inputs.chainsFrom() == null) {
                ins.setNull(9, java.sql.Types.INTEGER);
            } else {
                ins.setInt(9, inputs.chainsFrom());
            }
            ins.executeUpdate();
        } catch (SQLException e) {
            throw new StoreException("cannot start round " + round + " of pool " + poolId + ": " + e.getMessage(), e);
        }
    }

    /** What round {@code round} of the pool was computed from; empty for rounds stored before this was kept. */
    public java.util.Optional<Inputs> inputs(long poolId, int round) {
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT seed, sampler, settings, last_label_id, chains_from"
                     + " FROM rounds WHERE pool_id = ? AND round_no = ? AND seed IS NOT NULL")) {
            q.setLong(1, poolId);
            q.setInt(2, round);
            try (ResultSet rs = q.executeQuery()) {
                if (!rs.next()) {
                    return java.util.Optional.empty();
                }
                int from = rs.getInt(5);
                return java.util.Optional.of(new Inputs(rs.getLong(1), rs.getString(2), rs.getString(3), rs.getLong(4),
                        rs.wasNull() ? null : from));
            }
        } catch (SQLException e) {
            throw new StoreException("cannot read round " + round + " of pool " + poolId + ": " + e.getMessage(), e);
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

    /**
     * What a round told about whether more labels pay (see {@code Settling} in the rounds).
     *
     * @param candidates     the unlabelled records it picked from
     * @param agreement      Cohen's kappa of its stop-set predictions with the round before's (NaN: nothing to compare)
     * @param compared       the stop-set records compared
     * @param information    BALD summed over every candidate (nats)
     * @param informationTop BALD summed over the batch's best candidates (nats)
     */
    public record Settled(long candidates, double agreement, int compared, double information, double informationTop) {
    }

    /** A published round with a model, as the accuracy and stopping advice read it. */
    public record Evidence(int round, long labelsAtStart, Settled settled, String samplerJson, String healthJson) {
    }

    /** Keeps what round {@code round} told about whether more labels pay. */
    public void settled(long poolId, int round, Settled s) {
        try (Connection c = ds.getConnection();
             PreparedStatement u = c.prepareStatement("UPDATE rounds SET candidates = ?, agreement = ?,"
                     + " agreement_records = ?, information = ?, information_top = ? WHERE pool_id = ? AND round_no = ?")) {
            u.setLong(1, s.candidates());
            if (Double.isNaN(s.agreement())) {
                u.setNull(2, java.sql.Types.DOUBLE);
            } else {
                u.setDouble(2, s.agreement());
            }
            u.setInt(3, s.compared());
            u.setDouble(4, s.information());
            u.setDouble(5, s.informationTop());
            u.setLong(6, poolId);
            u.setInt(7, round);
            u.executeUpdate();
        } catch (SQLException e) {
            throw new StoreException("cannot record what round " + round + " told: " + e.getMessage(), e);
        }
    }

    /** The pool's published rounds that had a model and kept what they told, oldest first. */
    public List<Evidence> evidence(long poolId) {
        List<Evidence> out = new ArrayList<>();
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT round_no, labels_at_start, candidates, agreement,"
                     + " agreement_records, information, information_top, sampler, health FROM rounds"
                     + " WHERE pool_id = ? AND status = 'published' AND candidates IS NOT NULL ORDER BY round_no")) {
            q.setLong(1, poolId);
            try (ResultSet rs = q.executeQuery()) {
                while (rs.next()) {
                    double agreement = rs.getDouble(4);
                    if (rs.wasNull()) {
                        agreement = Double.NaN;
                    }
                    out.add(new Evidence(rs.getInt(1), rs.getLong(2), new Settled(rs.getLong(3), agreement, rs.getInt(5),
                            rs.getDouble(6), rs.getDouble(7)), rs.getString(8), rs.getString(9)));
                }
            }
        } catch (SQLException e) {
            throw new StoreException("cannot read the rounds of pool " + poolId + ": " + e.getMessage(), e);
        }
        return out;
    }

    /** The pool's rounds, newest first. */
    public List<RoundRow> list(long poolId) {
        List<RoundRow> out = new ArrayList<>();
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT round_no, status, started_at, finished_at,"
                     + " labels_at_start, kernel, message, health, sampler FROM rounds WHERE pool_id = ?"
                     + " ORDER BY round_no DESC")) {
            q.setLong(1, poolId);
            try (ResultSet rs = q.executeQuery()) {
                while (rs.next()) {
                    Timestamp done = rs.getTimestamp(4);
                    out.add(new RoundRow(rs.getInt(1), rs.getString(2), rs.getTimestamp(3).toInstant(),
                            done == null ? null : done.toInstant(), rs.getLong(5), rs.getString(6), rs.getString(7),
                            rs.getString(8), rs.getString(9)));
                }
            }
        } catch (SQLException e) {
            throw new StoreException("cannot list the rounds of pool " + poolId + ": " + e.getMessage(), e);
        }
        return out;
    }
}
