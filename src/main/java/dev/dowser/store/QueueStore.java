package dev.dowser.store;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Timestamp;
import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import javax.sql.DataSource;

/**
 * Publishes queues and hands their records out under leases. A record goes to one person at a
 * time: a lease is taken by a conditional update that succeeds only while the entry is free (never
 * leased, lease run out, or already this person's), so two people asking at once cannot both win
 * it. An entry is done once as many different people as its {@code copies} have labelled it, or a
 * reviewer has decided it; done entries are skipped, and nobody gets a record they labelled.
 */
public final class QueueStore {

    /** The live labels of queue entry q's record: each person's newest label row, unless it is a withdrawal. */
    static final String LIVE_LABELS = "FROM labels l WHERE l.pool_id = q.pool_id AND l.row_no = q.row_no"
            + " AND l.kind = 'label' AND NOT l.withdrawn AND NOT EXISTS (SELECT 1 FROM labels w"
            + " WHERE w.pool_id = l.pool_id AND w.row_no = l.row_no AND w.kind = 'label'"
            + " AND w.labelled_by = l.labelled_by AND w.id > l.id)";
    /** Queue entry q needs no more labels: enough people gave one, or a reviewer decided. */
    static final String DONE = "((SELECT COUNT(*) " + LIVE_LABELS + ") >= q.copies OR EXISTS (SELECT 1 FROM labels r"
            + " WHERE r.pool_id = q.pool_id AND r.row_no = q.row_no AND r.kind <> 'label'))";
    /**
     * After a label row on one record (author, pool and row bound): its queue entries' done flag
     * follows the labels, and the author's lease on it ends, since they have acted on it; a record
     * wanted by two people is then free for the second at once.
     */
    static final String AFTER_LABEL_ROW = "UPDATE queue_entries q SET done = " + DONE
            + ", leased_to = CASE WHEN q.leased_to = ?1 THEN NULL ELSE q.leased_to END"
            + ", lease_until = CASE WHEN q.leased_to = ?1 THEN NULL ELSE q.lease_until END"
            + " WHERE q.pool_id = ?2 AND q.row_no = ?3";

    /** The person bound to the next parameter has a live label on queue entry q's record. */
    static final String LABELLED_BY_PERSON = "EXISTS (SELECT 1 " + LIVE_LABELS + " AND l.labelled_by = ?)";

    /** One entry of the served queue as the overview shows it. */
    public record Served(QueueEntry entry, boolean labelled) {
    }

    private final DataSource ds;
    private final Clock clock;

    QueueStore(DataSource ds, Clock clock) {
        this.ds = ds;
        this.clock = clock;
    }

    /** Writes a round's queue and makes it the one served, in one transaction. */
    public void publish(long poolId, int round, List<QueueEntry> entries) {
        try {
            Transactions.run(ds, c -> {
                try (PreparedStatement ins = c.prepareStatement("INSERT INTO queue_entries (pool_id, round_no, position,"
                        + " row_no, score, spot_check, prediction, copies, pick_probability, pick_order)"
                        + " VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)");
                     PreparedStatement del = c.prepareStatement("DELETE FROM served_queues WHERE pool_id = ?");
                     PreparedStatement serve = c.prepareStatement(
                             "INSERT INTO served_queues (pool_id, round_no) VALUES (?, ?)")) {
                    for (QueueEntry e : entries) {
                        ins.setLong(1, poolId);
                        ins.setInt(2, round);
                        ins.setInt(3, e.position());
                        ins.setLong(4, e.row());
                        ins.setDouble(5, e.score());
                        ins.setBoolean(6, e.spotCheck());
                        ins.setString(7, e.predictionJson());
                        ins.setInt(8, e.copies());
                        if (e.pickProbability() == null) {
                            ins.setNull(9, java.sql.Types.DOUBLE);
                        } else {
                            ins.setDouble(9, e.pickProbability());
                        }
                        if (e.pickOrder() == null) {
                            ins.setNull(10, java.sql.Types.INTEGER);
                        } else {
                            ins.setInt(10, e.pickOrder());
                        }
                        ins.addBatch();
                    }
                    ins.executeBatch();
                    // Records labelled while the round ran are done already.
                    markDone(c, poolId, round);
                    del.setLong(1, poolId);
                    del.executeUpdate();
                    serve.setLong(1, poolId);
                    serve.setInt(2, round);
                    serve.executeUpdate();
                }
                return null;
            });
            // Once more after the commit: a label given while the queue was being written could not
            // see its entries and so could not mark them done itself.
            try (Connection c = ds.getConnection()) {
                markDone(c, poolId, round);
            }
        } catch (SQLException e) {
            throw new StoreException("cannot publish the queue of round " + round + ": " + e.getMessage(), e);
        }
    }

    private static void markDone(Connection c, long poolId, int round) throws SQLException {
        try (PreparedStatement done = c.prepareStatement("UPDATE queue_entries q SET done = TRUE"
                + " WHERE q.pool_id = ? AND q.round_no = ? AND NOT q.done AND " + DONE)) {
            done.setLong(1, poolId);
            done.setInt(2, round);
            done.executeUpdate();
        }
    }

    /** The round whose queue is served, if any. */
    public Optional<Integer> servedRound(long poolId) {
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT round_no FROM served_queues WHERE pool_id = ?")) {
            q.setLong(1, poolId);
            try (ResultSet rs = q.executeQuery()) {
                return rs.next() ? Optional.of(rs.getInt(1)) : Optional.empty();
            }
        } catch (SQLException e) {
            throw new StoreException("cannot read the served queue of pool " + poolId + ": " + e.getMessage(), e);
        }
    }

    /**
     * Leases the first free record of the served queue that still needs a label and that
     * {@code person} has not labelled, for {@code lease}; a record this person already holds comes
     * back to them first. Empty when the queue has nothing left for them.
     */
    public Optional<QueueEntry> lease(long poolId, String person, Duration lease) {
        Instant now = clock.instant();
        Instant until = now.plus(lease);
        // Two cheap reads instead of one sorted one: the entry this person holds, else the first free
        // ones in queue order. Whether the person
        // labelled an entry is asked only of entries wanted by two, the only ones it can be true for.
        // The served round is read first and bound as a value: as a subquery it was evaluated for every
        // entry of every round of the pool.
        Optional<Integer> served = servedRound(poolId);
        if (served.isEmpty()) {
            return Optional.empty();
        }
        String columns = "SELECT q.round_no, q.position, q.row_no, q.score, q.spot_check, q.prediction, q.copies,"
                + " q.pick_probability FROM queue_entries q WHERE q.pool_id = ? AND q.round_no = ?"
                + " AND q.done = FALSE AND (q.copies = 1 OR NOT " + LABELLED_BY_PERSON + ")";
        // Ordered by every column of queue_entries_open, so that the database reads that index in order
        // from the first open entry and stops after a few, rather than sorting all of them.
        String inOrder = " ORDER BY q.pool_id, q.round_no, q.done, q.position";
        try (Connection c = ds.getConnection();
             PreparedStatement held = c.prepareStatement(columns + " AND q.leased_to = ?" + inOrder
                     + " FETCH FIRST 1 ROW ONLY");
             PreparedStatement free = c.prepareStatement(columns + " AND (q.leased_to IS NULL OR q.lease_until <= ?)"
                     + inOrder + " FETCH FIRST 16 ROWS ONLY");
             PreparedStatement take = c.prepareStatement("UPDATE queue_entries SET leased_to = ?, lease_until = ?"
                     + " WHERE pool_id = ? AND round_no = ? AND position = ?"
                     + " AND (leased_to IS NULL OR lease_until <= ? OR leased_to = ?)")) {
            for (PreparedStatement find : List.of(held, free)) {
                find.setLong(1, poolId);
                find.setInt(2, served.get());
                find.setString(3, person);
            }
            held.setString(4, person);
            free.setTimestamp(4, Timestamp.from(now));
            while (true) {
                boolean any = false;
                for (PreparedStatement find : List.of(held, free)) {
                    try (ResultSet rs = find.executeQuery()) {
                        while (rs.next()) {
                            any = true;
                            int round = rs.getInt(1);
                            int position = rs.getInt(2);
                            take.setString(1, person);
                            take.setTimestamp(2, Timestamp.from(until));
                            take.setLong(3, poolId);
                            take.setInt(4, round);
                            take.setInt(5, position);
                            take.setTimestamp(6, Timestamp.from(now));
                            take.setString(7, person);
                            if (take.executeUpdate() == 1) {
                                return Optional.of(new QueueEntry(round, position, rs.getLong(3), rs.getDouble(4),
                                        rs.getBoolean(5), rs.getString(6), person, until, rs.getInt(7),
                                        probability(rs, 8)));
                            }
                        }
                    }
                }
                if (!any) {
                    return Optional.empty();
                }
            }
        } catch (SQLException e) {
            throw new StoreException("cannot lease a record of pool " + poolId + ": " + e.getMessage(), e);
        }
    }

    /**
     * Leases the record at {@code row} to {@code person} if the served queue holds it, whoever held
     * it before: after taking back a label, its record comes back to the one who labelled it.
     */
    public void leaseRow(long poolId, long row, String person, Duration lease) {
        try (Connection c = ds.getConnection();
             PreparedStatement u = c.prepareStatement("UPDATE queue_entries SET leased_to = ?, lease_until = ?"
                     + " WHERE pool_id = ? AND row_no = ? AND round_no = (SELECT round_no FROM served_queues"
                     + " WHERE pool_id = ?)")) {
            u.setString(1, person);
            u.setTimestamp(2, Timestamp.from(clock.instant().plus(lease)));
            u.setLong(3, poolId);
            u.setLong(4, row);
            u.setLong(5, poolId);
            u.executeUpdate();
        } catch (SQLException e) {
            throw new StoreException("cannot lease row " + row + ": " + e.getMessage(), e);
        }
    }

    /** The served queue in order, with its leases and whether each record is done (labelled enough, or decided). */
    public List<Served> served(long poolId) {
        List<Served> out = new ArrayList<>();
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT q.round_no, q.position, q.row_no, q.score, q.spot_check,"
                     + " q.prediction, q.leased_to, q.lease_until, q.done, q.copies, q.pick_probability"
                     + " FROM queue_entries q JOIN served_queues s ON s.pool_id = q.pool_id AND s.round_no = q.round_no"
                     + " WHERE q.pool_id = ? ORDER BY q.position")) {
            q.setLong(1, poolId);
            try (ResultSet rs = q.executeQuery()) {
                while (rs.next()) {
                    Timestamp until = rs.getTimestamp(8);
                    out.add(new Served(new QueueEntry(rs.getInt(1), rs.getInt(2), rs.getLong(3), rs.getDouble(4),
                            rs.getBoolean(5), rs.getString(6), rs.getString(7),
                            until == null ? null : until.toInstant(), rs.getInt(10), probability(rs, 11)),
                            rs.getBoolean(9)));
                }
            }
        } catch (SQLException e) {
            throw new StoreException("cannot read the served queue of pool " + poolId + ": " + e.getMessage(), e);
        }
        return out;
    }

    /**
     * Entries of the served queue that one person has labelled and a second still should: a new
     * queue carries them over, so that a round never cuts a pair of labels in half.
     */
    public List<QueueEntry> awaitingSecondLabel(long poolId) {
        List<QueueEntry> out = new ArrayList<>();
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT q.round_no, q.position, q.row_no, q.score, q.spot_check,"
                     + " q.prediction, q.pick_probability FROM queue_entries q JOIN served_queues s"
                     + " ON s.pool_id = q.pool_id AND s.round_no = q.round_no WHERE q.pool_id = ? AND q.copies = 2"
                     + " AND NOT q.done"
                     + " AND (SELECT COUNT(*) " + LIVE_LABELS + ") > 0 ORDER BY q.position")) {
            q.setLong(1, poolId);
            try (ResultSet rs = q.executeQuery()) {
                while (rs.next()) {
                    out.add(new QueueEntry(rs.getInt(1), rs.getInt(2), rs.getLong(3), rs.getDouble(4),
                            rs.getBoolean(5), rs.getString(6), null, null, 2, probability(rs, 7)));
                }
            }
        } catch (SQLException e) {
            throw new StoreException("cannot read the served queue of pool " + poolId + ": " + e.getMessage(), e);
        }
        return out;
    }

    /** Every spot check ever queued for the pool, oldest round first: the model's belief at queue time. */
    public List<QueueEntry> spotChecks(long poolId) {
        List<QueueEntry> out = new ArrayList<>();
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT round_no, position, row_no, score, prediction"
                     + " FROM queue_entries WHERE pool_id = ? AND spot_check ORDER BY round_no, position")) {
            q.setLong(1, poolId);
            try (ResultSet rs = q.executeQuery()) {
                while (rs.next()) {
                    out.add(new QueueEntry(rs.getInt(1), rs.getInt(2), rs.getLong(3), rs.getDouble(4), true,
                            rs.getString(5), null, null));
                }
            }
        } catch (SQLException e) {
            throw new StoreException("cannot read the spot checks of pool " + poolId + ": " + e.getMessage(), e);
        }
        return out;
    }

    /**
     * One record as its round picked it: its place and probability in the round's sequence of
     * picks, whether it was a spot check, and the serving model's belief when it was queued.
     */
    public record Picked(int round, int order, long row, boolean spotCheck, Double probability, String predictionJson) {
    }

    /**
     * Every record a round picked itself (not those carried over), oldest round first and in pick
     * order within a round: what the accuracy estimates weigh the labels by.
     */
    public List<Picked> picks(long poolId) {
        List<Picked> out = new ArrayList<>();
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT round_no, pick_order, row_no, spot_check,"
                     + " pick_probability, prediction FROM queue_entries WHERE pool_id = ? AND pick_order IS NOT NULL"
                     + " ORDER BY round_no, pick_order")) {
            q.setLong(1, poolId);
            try (ResultSet rs = q.executeQuery()) {
                while (rs.next()) {
                    out.add(new Picked(rs.getInt(1), rs.getInt(2), rs.getLong(3), rs.getBoolean(4), probability(rs, 5),
                            rs.getString(6)));
                }
            }
        } catch (SQLException e) {
            throw new StoreException("cannot read the picks of pool " + poolId + ": " + e.getMessage(), e);
        }
        return out;
    }

    /**
     * Each record ever queued in the pool, by row, with its entry in the first round that queued it:
     * the round, whether it was a spot check, and the model's belief before anyone labelled it.
     */
    public Map<Long, QueueEntry> firstQueued(long poolId) {
        Map<Long, QueueEntry> out = new HashMap<>();
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT round_no, position, row_no, score, spot_check, prediction,"
                     + " copies FROM queue_entries WHERE pool_id = ? ORDER BY round_no, position")) {
            q.setFetchSize(4_096);
            q.setLong(1, poolId);
            try (ResultSet rs = q.executeQuery()) {
                while (rs.next()) {
                    out.putIfAbsent(rs.getLong(3), new QueueEntry(rs.getInt(1), rs.getInt(2), rs.getLong(3),
                            rs.getDouble(4), rs.getBoolean(5), rs.getString(6), null, null, rs.getInt(7)));
                }
            }
        } catch (SQLException e) {
            throw new StoreException("cannot read the queues of pool " + poolId + ": " + e.getMessage(), e);
        }
        return out;
    }

    /** Gives a lease back early (a skip): the record is free for the next person at once. */
    public void release(long poolId, int round, int position, String person) {
        try (Connection c = ds.getConnection();
             PreparedStatement u = c.prepareStatement("UPDATE queue_entries SET leased_to = NULL, lease_until = NULL"
                     + " WHERE pool_id = ? AND round_no = ? AND position = ? AND leased_to = ?")) {
            u.setLong(1, poolId);
            u.setInt(2, round);
            u.setInt(3, position);
            u.setString(4, person);
            u.executeUpdate();
        } catch (SQLException e) {
            throw new StoreException("cannot release the lease: " + e.getMessage(), e);
        }
    }

    /** A pick's probability, or null where none was kept. */
    private static Double probability(ResultSet rs, int column) throws SQLException {
        double q = rs.getDouble(column);
        return rs.wasNull() ? null : q;
    }
}
