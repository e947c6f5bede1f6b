package dev.dowser.store;

import java.sql.SQLException;
import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.Optional;

/**
 * Hands the served queue's records out under leases. A lease belongs to a record, so at most one
 * person holds a record at any moment whichever queue offered it: the key of {@code leases} says
 * so, and a lease is taken by one statement that succeeds only while the record is free (never
 * leased, lease run out, or already this person's). Nobody gets a record they labelled, and a
 * record someone skipped goes to them again only when nothing else is open for them.
 */
public final class LeaseStore {

    /** Open places read at a time; some may be taken by others before this person's turn. */
    static final int CANDIDATES = 16;
    /** SQLSTATE of a unique key violation: two people took the same free record at once. */
    static final String UNIQUE_VIOLATION = "23505";
    static final int MAX_PASSES = 64;
    /** Queues published while one person's lease is looked for, at most, before giving up. */
    static final int MAX_ROUNDS_SEEN = 4;

    private static final String TAKE = "MERGE INTO leases h USING (VALUES (CAST(? AS BIGINT), CAST(? AS BIGINT),"
            + " CAST(? AS VARCHAR(100)), CAST(? AS TIMESTAMP WITH TIME ZONE))) v (pool_id, row_no, person, lease_until)"
            + " ON h.pool_id = v.pool_id AND h.row_no = v.row_no"
            + " WHEN MATCHED AND (h.lease_until <= ? OR h.person = v.person) THEN UPDATE SET person = v.person,"
            + " lease_until = v.lease_until"
            + " WHEN NOT MATCHED THEN INSERT (pool_id, row_no, person, lease_until)"
            + " VALUES (v.pool_id, v.row_no, v.person, v.lease_until)";

    private final Sql sql;
    private final Clock clock;
    private final QueueStore queues;

    LeaseStore(Sql sql, Clock clock, QueueStore queues) {
        this.sql = sql;
        this.clock = clock;
        this.queues = queues;
    }

    /**
     * Leases {@code person} a record of the served queue for {@code lease}: the one they hold, if
     * any; else the first open place in queue order (the batch, then the reserve) that they have
     * neither labelled nor skipped; else, once that is all taken, a few records drawn at random are
     * appended; else a record they skipped. Empty when the queue has nothing left for them.
     */
    public Optional<QueueEntry> lease(long poolId, String person, Duration lease) {
        // A round may publish while this runs: then look again in the queue it published.
        Optional<Integer> served = queues.servedRound(poolId);
        for (int attempt = 0; served.isPresent() && attempt < MAX_ROUNDS_SEEN; attempt++) {
            Optional<QueueEntry> e = leaseFrom(poolId, served.get(), person, lease);
            Optional<Integer> now = queues.servedRound(poolId);
            if (e.isPresent() || now.equals(served)) {
                return e;
            }
            served = now;
        }
        return Optional.empty();
    }

    private Optional<QueueEntry> leaseFrom(long poolId, int round, String person, Duration lease) {
        Optional<QueueEntry> held = sql.first("read the lease of " + person, "SELECT " + QueueStore.COLUMNS
                + " FROM leases h JOIN queue_entries q ON q.pool_id = h.pool_id AND q.row_no = h.row_no"
                + " WHERE h.pool_id = ? AND h.person = ? AND h.lease_until > ? AND q.round_no = ?"
                + " ORDER BY q.position", rs -> QueueStore.entry(rs, null, null), poolId, person, clock.instant(), round);
        if (held.isPresent()) {
            // Their own record comes back even if a late label arrived meanwhile: the place is still theirs.
            Optional<QueueEntry> again = take(poolId, held.get(), person, lease, false);
            if (again.isPresent()) {
                return again;
            }
        }
        Optional<QueueEntry> next = firstFree(poolId, round, person, lease, false);
        // Only while this round is served: if a new one was published meanwhile, the caller looks there first.
        if (next.isEmpty() && queues.appendRandom(poolId, round) > 0) {
            next = firstFree(poolId, round, person, lease, false);
        }
        return next.isPresent() ? next : firstFree(poolId, round, person, lease, true);
    }

    private Optional<QueueEntry> firstFree(long poolId, int round, String person, Duration lease, boolean skipped) {
        // Ordered by every column of queue_entries_open, so that the database reads that index in order
        // from the first open place and stops after a few, rather than sorting all of them.
        String find = "SELECT " + QueueStore.COLUMNS + " FROM queue_entries q WHERE q.pool_id = ? AND q.round_no = ?"
                + " AND q.done = FALSE AND NOT " + QueueStore.HELD
                + " AND (q.copies = 1 OR NOT " + QueueStore.LABELLED_BY_PERSON + ")"
                + " AND NOT " + QueueStore.ENOUGH
                + " AND " + (skipped ? "" : "NOT ") + "EXISTS (SELECT 1 FROM skips s WHERE s.pool_id = q.pool_id"
                + " AND s.person = ? AND s.row_no = q.row_no)"
                + " ORDER BY q.pool_id, q.round_no, q.done, q.position FETCH FIRST " + CANDIDATES + " ROWS ONLY";
        // Each pass either takes a record or finds the ones it tried taken by others since; a bound all the same.
        for (int pass = 0; pass < MAX_PASSES; pass++) {
            List<QueueEntry> open = sql.list("find a record for " + person, find, rs -> QueueStore.entry(rs, null, null),
                    poolId, round, clock.instant(), person, person);
            if (open.isEmpty()) {
                return Optional.empty();
            }
            for (QueueEntry e : open) {
                Optional<QueueEntry> taken = take(poolId, e, person, lease, true);
                if (taken.isPresent()) {
                    return taken;
                }
            }
        }
        return Optional.empty();
    }

    /**
     * Takes the entry's record for {@code person} if it is free; the entry with its lease, or empty.
     * With {@code stillOpen}, only while the place still wants a label from this person: the open
     * places were read a moment ago, and someone may have labelled the record since.
     */
    private Optional<QueueEntry> take(long poolId, QueueEntry e, String person, Duration lease, boolean stillOpen) {
        Instant now = clock.instant();
        Instant until = now.plus(lease);
        return sql.transaction("lease a record of pool " + poolId, c -> {
            try {
                if (Sql.update(c, TAKE, poolId, e.row(), person, until, now) != 1) {
                    return Optional.empty();
                }
            } catch (SQLException ex) {
                if (UNIQUE_VIOLATION.equals(ex.getSQLState())) {
                    c.rollback();
                    return Optional.empty();
                }
                throw ex;
            }
            if (stillOpen && Sql.first(c, "SELECT 1 FROM queue_entries q WHERE q.pool_id = ? AND q.round_no = ?"
                    + " AND q.position = ? AND NOT q.done AND NOT " + QueueStore.ENOUGH + " AND (q.copies = 1 OR NOT "
                    + QueueStore.LABELLED_BY_PERSON + ")", rs -> 1, poolId, e.round(), e.position(), person).isEmpty()) {
                c.rollback();
                return Optional.empty();
            }
            return Optional.of(new QueueEntry(e.round(), e.position(), e.row(), e.score(), e.spotCheck(),
                    e.predictionJson(), person, until, e.copies(), e.pickProbability(), e.pickOrder(), e.reserve()));
        });
    }

    /**
     * Leases the record at {@code row} to {@code person} if the served queue holds it, nobody else
     * does, and its place still wants a label from them: after taking back a label, the record comes
     * back to the one who gave it, unless someone else took it and labelled it in the meantime.
     */
    public void leaseRow(long poolId, long row, String person, Duration lease) {
        // The label was withdrawn in a transaction of its own, so the record may have gone to someone
        // else and been labelled since: the same check as any lease, or two people label a single place.
        sql.first("find row " + row + " in the served queue", "SELECT " + QueueStore.COLUMNS
                + " FROM " + QueueStore.SERVED_ENTRIES
                + " WHERE q.pool_id = ? AND q.row_no = ?", rs -> QueueStore.entry(rs, null, null), poolId, row)
                .ifPresent(e -> take(poolId, e, person, lease, true));
    }

    /** Gives {@code person}'s lease on a queue place back at once: the record is free for the next person. */
    public void release(long poolId, int round, int position, String person) {
        sql.transaction("release the lease", c -> {
            Optional<Long> row = Sql.first(c, "SELECT row_no FROM queue_entries WHERE pool_id = ? AND round_no = ?"
                    + " AND position = ?", rs -> rs.getLong(1), poolId, round, position);
            if (row.isPresent() && Sql.update(c, "DELETE FROM leases WHERE pool_id = ? AND row_no = ? AND person = ?",
                    poolId, row.get(), person) > 0) {
                // A late label by someone else may have been waiting on this lease to end.
                Sql.update(c, QueueStore.REFRESH_DONE, clock.instant(), poolId, row.get());
            }
            return null;
        });
    }

    /**
     * A skip: gives the lease back, and the record is not offered to {@code person} again while
     * anything else is open for them; others still get it.
     */
    public void skip(long poolId, int round, int position, String person) {
        release(poolId, round, position, person);
        sql.update("remember the skip", "MERGE INTO skips s USING (SELECT pool_id, row_no FROM queue_entries"
                + " WHERE pool_id = ? AND round_no = ? AND position = ?) e ON s.pool_id = e.pool_id"
                + " AND s.row_no = e.row_no AND s.person = ? WHEN MATCHED THEN UPDATE SET skipped_at = ?"
                + " WHEN NOT MATCHED THEN INSERT (pool_id, person, row_no, skipped_at)"
                + " VALUES (e.pool_id, ?, e.row_no, ?)", poolId, round, position, person, clock.instant(), person,
                clock.instant());
    }
}
