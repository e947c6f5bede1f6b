package dev.dowser.store;

import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Clock;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Collections;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.ThreadLocalRandom;

/**
 * Publishes queues and says where the served one stands. A round's queue is its batch, then the
 * next-best records (its reserve), served once the batch is taken while the next round runs.
 * Publishing carries over the records still in hand (leased, or labelled by one of the two people
 * who should), never queues a record twice, and leaves leases alone ({@link LeaseStore}). An entry
 * is done once as many different people as its {@code copies} have labelled it, or a reviewer has
 * decided it, and nobody holds it under a live lease: a label that came late, after its lease ran
 * out and the record went to someone else, is kept but does not end the other person's work.
 */
public final class QueueStore {

    /** The live labels of queue entry q's record: each person's newest label row, unless it is a withdrawal. */
    static final String LIVE_LABELS = "FROM labels l WHERE l.pool_id = q.pool_id AND l.row_no = q.row_no"
            + " AND l.kind = 'label' AND NOT l.withdrawn AND NOT EXISTS (SELECT 1 FROM labels w"
            + " WHERE w.pool_id = l.pool_id AND w.row_no = l.row_no AND w.kind = 'label'"
            + " AND w.labelled_by = l.labelled_by AND w.id > l.id)";
    /** Queue entry q's record has the labels it asked for: enough people gave one, or a reviewer decided. */
    static final String ENOUGH = "((SELECT COUNT(*) " + LIVE_LABELS + ") >= q.copies OR EXISTS (SELECT 1 FROM labels r"
            + " WHERE r.pool_id = q.pool_id AND r.row_no = q.row_no AND r.kind <> 'label'))";
    /** The served queue's entries, as q (to follow FROM). */
    static final String SERVED_ENTRIES = "queue_entries q JOIN served_queues s ON s.pool_id = q.pool_id"
            + " AND s.round_no = q.round_no";
    /** Someone holds queue entry q's record under a lease that runs past the instant bound next. */
    static final String HELD = "EXISTS (SELECT 1 FROM leases h WHERE h.pool_id = q.pool_id AND h.row_no = q.row_no"
            + " AND h.lease_until > ?)";
    /**
     * Queue entry q is done (the instant bound next is now). A holder has not labelled it: a label
     * row ends its author's lease in the same transaction.
     */
    static final String DONE = "(" + ENOUGH + " AND NOT " + HELD + ")";
    /** The person bound to the next parameter has a live label on queue entry q's record. */
    static final String LABELLED_BY_PERSON = "EXISTS (SELECT 1 " + LIVE_LABELS + " AND l.labelled_by = ?)";
    /** Refreshes the done flag of a record's entries in every round (now, pool and row bound). */
    static final String REFRESH_DONE = "UPDATE queue_entries q SET done = " + DONE
            + " WHERE q.pool_id = ? AND q.row_no = ?";

    static final String COLUMNS = "q.round_no, q.position, q.row_no, q.score, q.spot_check, q.prediction, q.copies,"
            + " q.pick_probability, q.pick_order, q.reserve";

    /** How many records a desk with nothing left appends at random (rare: only once a round's reserve is used up). */
    static final int RANDOM_APPEND = 10;
    /** Rows looked at for them, at most: a pool nearly all labelled is searched this far and no further. */
    static final int MAX_PROBES = 20_000;
    /** Rows read together in that search: one query tells which of them are labelled or queued. */
    static final int SEARCH_BLOCK = 256;

    /**
     * One entry of the served queue as the overview shows it: who holds it (null when nobody),
     * whether it is done, and whether one of its two people has labelled it and the other is awaited.
     */
    public record Served(QueueEntry entry, boolean labelled, boolean awaitingSecondLabel) {
    }

    private final Sql sql;
    private final Clock clock;

    QueueStore(Sql sql, Clock clock) {
        this.sql = sql;
        this.clock = clock;
    }

    private static long gcd(long a, long b) {
        return b == 0 ? a : gcd(b, a % b);
    }

    /** Reads an entry from the columns of {@link #COLUMNS}, held by {@code leasedTo} until {@code until}. */
    static QueueEntry entry(ResultSet rs, String leasedTo, Instant until) throws SQLException {
        return new QueueEntry(rs.getInt(1), rs.getInt(2), rs.getLong(3), rs.getDouble(4), rs.getBoolean(5),
                rs.getString(6), leasedTo, until, rs.getInt(7), Sql.nullableDouble(rs, 8), Sql.nullableInt(rs, 9),
                rs.getBoolean(10));
    }

    /**
     * Publishes round {@code round}'s queue and makes it the one served, in one transaction. Its
     * places are, in order: the served queue's records still in hand (leased, or awaiting their
     * second label), then {@code batch}, then {@code reserve} (the next-best records), each record
     * once. Entries of earlier rounds' reserves that nobody finished are deleted. Returns the places.
     */
    public List<QueueEntry> publish(long poolId, int round, List<QueueEntry> batch, List<QueueEntry> reserve) {
        List<QueueEntry> published = sql.transaction("publish the queue of round " + round, c -> {
            Instant now = clock.instant();
            Optional<Integer> old = Sql.first(c, "SELECT round_no FROM served_queues WHERE pool_id = ? FOR UPDATE",
                    rs -> rs.getInt(1), poolId);
            List<QueueEntry> carried = old.isEmpty() ? List.of() : Sql.list(c, "SELECT " + COLUMNS
                    + " FROM queue_entries q WHERE q.pool_id = ? AND q.round_no = ? AND NOT q.done AND (" + HELD
                    + " OR (q.copies = 2 AND (SELECT COUNT(*) " + LIVE_LABELS + ") > 0)) ORDER BY q.position",
                    rs -> entry(rs, null, null), poolId, old.get(), now);
            List<QueueEntry> places = new ArrayList<>();
            Set<Long> rows = new HashSet<>();
            // A carried record keeps its place among the picks of the round that picked it, in that round's entry.
            for (QueueEntry e : carried) {
                add(places, rows, e, round, null, false);
            }
            batch.forEach(e -> add(places, rows, e, round, e.pickOrder(), false));
            reserve.forEach(e -> add(places, rows, e, round, null, true));
            insert(c, poolId, places);
            // Records labelled while the round ran are done already.
            markDone(c, poolId, round, now);
            // A reserve place someone holds stays until its next publish: the desk names the record by its
            // round and position to skip or release it, and a place gone would make both a no-op.
            Sql.update(c, "DELETE FROM queue_entries q WHERE q.pool_id = ? AND q.round_no <> ? AND q.reserve"
                    + " AND NOT q.done AND NOT " + HELD, poolId, round, now);
            Sql.update(c, "DELETE FROM served_queues WHERE pool_id = ?", poolId);
            Sql.update(c, "INSERT INTO served_queues (pool_id, round_no) VALUES (?, ?)", poolId, round);
            return places;
        });
        // Once more after the commit: a label given while the queue was being written could not see
        // its entries and so could not mark them done itself.
        sql.connected("mark the done records of round " + round, c -> {
            markDone(c, poolId, round, clock.instant());
            return null;
        });
        return published;
    }

    /** Publishes a queue with no reserve: once its places are taken, the desk waits for the next round. */
    public List<QueueEntry> publish(long poolId, int round, List<QueueEntry> batch) {
        return publish(poolId, round, batch, List.of());
    }

    private static void add(List<QueueEntry> places, Set<Long> rows, QueueEntry e, int round, Integer pickOrder,
                            boolean reserve) {
        if (rows.add(e.row())) {
            places.add(new QueueEntry(round, places.size(), e.row(), e.score(), e.spotCheck(), e.predictionJson(),
                    null, null, e.copies(), e.pickProbability(), pickOrder, reserve));
        }
    }

    private static void insert(Connection c, long poolId, List<QueueEntry> places) throws SQLException {
        List<Object[]> rows = new ArrayList<>(places.size());
        for (QueueEntry e : places) {
            rows.add(new Object[] {poolId, e.round(), e.position(), e.row(), e.score(), e.spotCheck(),
                e.predictionJson(), e.copies(), e.pickProbability(), e.pickOrder(), e.reserve()});
        }
        Sql.batch(c, "INSERT INTO queue_entries (pool_id, round_no, position, row_no, score, spot_check, prediction,"
                + " copies, pick_probability, pick_order, reserve) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)", rows);
    }

    private static void markDone(Connection c, long poolId, int round, Instant now) throws SQLException {
        Sql.update(c, "UPDATE queue_entries q SET done = TRUE WHERE q.pool_id = ? AND q.round_no = ? AND NOT q.done"
                + " AND " + DONE, poolId, round, now);
    }

    /** The round whose queue is served, if any. */
    public Optional<Integer> servedRound(long poolId) {
        return sql.first("read the served queue of pool " + poolId,
                "SELECT round_no FROM served_queues WHERE pool_id = ?", rs -> rs.getInt(1), poolId);
    }

    /**
     * Places of the served queue's batch that anyone may still take: not done and not held. Reserve
     * places are not counted: when this falls to the low-water mark the next round should start.
     */
    public int openInBatch(long poolId) {
        return sql.first("count the open records of pool " + poolId, "SELECT COUNT(*) FROM " + SERVED_ENTRIES
                + " WHERE q.pool_id = ? AND NOT q.done AND NOT q.reserve AND NOT " + HELD,
                rs -> rs.getInt(1), poolId, clock.instant()).orElse(0);
    }

    /**
     * Names of the pools that need a round to serve them, among those with records nobody has
     * labelled: every pool with no served queue, and (when {@code shortAt} is not negative) every
     * pool whose served batch is short: at most {@code shortAt} of its places open, or at most half.
     */
    public List<String> poolsToServe(int shortAt) {
        record Pool(long id, String name, long records, boolean served) {
        }
        List<Pool> pools = sql.list("find the pools to serve", "SELECT p.id, p.name, p.record_count,"
                + " s.round_no IS NOT NULL FROM pools p LEFT JOIN served_queues s ON s.pool_id = p.id"
                + (shortAt < 0 ? " WHERE s.round_no IS NULL" : "") + " ORDER BY p.name",
                rs -> new Pool(rs.getLong(1), rs.getString(2), rs.getLong(3), rs.getBoolean(4)));
        List<String> out = new ArrayList<>();
        for (Pool p : pools) {
            if ((!p.served() || isShort(p.id(), shortAt)) && labelledRecords(p.id()) < p.records()) {
                out.add(p.name());
            }
        }
        return out;
    }

    private boolean isShort(long poolId, int shortAt) {
        int places = sql.first("count the batch of pool " + poolId, "SELECT COUNT(*) FROM " + SERVED_ENTRIES
                + " WHERE q.pool_id = ? AND NOT q.reserve", rs -> rs.getInt(1), poolId).orElse(0);
        int open = openInBatch(poolId);
        return shortAt >= 0 && (open <= shortAt || 2 * open <= places);
    }

    /** Records of the pool that anyone has labelled or a reviewer decided, withdrawn labels included. */
    private long labelledRecords(long poolId) {
        return sql.first("count the labelled records of pool " + poolId, "SELECT COUNT(DISTINCT row_no) FROM labels"
                + " WHERE pool_id = ?", rs -> rs.getLong(1), poolId).orElse(0L);
    }

    /**
     * The served queue in order with who holds what, and whether each record is done. Reserve places
     * that nobody has touched yet are left out; {@link #reserveLeft} counts them.
     */
    public List<Served> served(long poolId) {
        Instant now = clock.instant();
        return sql.list("read the served queue of pool " + poolId, "SELECT " + COLUMNS
                + ", h.person, h.lease_until, q.done, (SELECT COUNT(*) " + LIVE_LABELS + ")"
                + " FROM " + SERVED_ENTRIES
                + " LEFT JOIN leases h ON h.pool_id = q.pool_id AND h.row_no = q.row_no AND h.lease_until > ?"
                + " WHERE q.pool_id = ? AND (NOT q.reserve OR q.done OR h.person IS NOT NULL"
                + " OR (SELECT COUNT(*) " + LIVE_LABELS + ") > 0) ORDER BY q.position",
                rs -> {
                    // The entry's own columns come first (COLUMNS), then the lease, the flag and the live labels.
                    int after = COLUMNS.split(",").length;
                    QueueEntry e = entry(rs, rs.getString(after + 1), Sql.instant(rs, after + 2));
                    boolean done = rs.getBoolean(after + 3);
                    return new Served(e, done, e.copies() == 2 && !done && rs.getInt(after + 4) == 1);
                }, now, poolId);
    }

    /** Reserve places of the served queue that nobody has taken yet. */
    public int reserveLeft(long poolId) {
        return sql.first("count the reserve of pool " + poolId, "SELECT COUNT(*) FROM " + SERVED_ENTRIES
                + " WHERE q.pool_id = ? AND q.reserve AND NOT q.done AND NOT " + HELD
                + " AND (SELECT COUNT(*) " + LIVE_LABELS + ") = 0", rs -> rs.getInt(1), poolId, clock.instant())
                .orElse(0);
    }

    /** Every spot check ever queued for the pool, oldest round first: the model's belief at queue time. */
    public List<QueueEntry> spotChecks(long poolId) {
        return sql.list("read the spot checks of pool " + poolId, "SELECT " + COLUMNS + " FROM queue_entries q"
                + " WHERE q.pool_id = ? AND q.spot_check ORDER BY q.round_no, q.position",
                rs -> entry(rs, null, null), poolId);
    }

    /**
     * One record as its round picked it: its place and probability in the round's sequence of
     * picks, whether it was a spot check, and the serving model's belief when it was queued.
     */
    public record Picked(int round, int order, long row, boolean spotCheck, Double probability, String predictionJson) {
    }

    /**
     * Every record a round picked itself (not those carried over, nor its reserve), oldest round
     * first and in pick order within a round: what the accuracy estimates weigh the labels by.
     */
    public List<Picked> picks(long poolId) {
        return sql.list("read the picks of pool " + poolId, "SELECT round_no, pick_order, row_no, spot_check,"
                + " pick_probability, prediction FROM queue_entries WHERE pool_id = ? AND pick_order IS NOT NULL"
                + " ORDER BY round_no, pick_order", rs -> new Picked(rs.getInt(1), rs.getInt(2), rs.getLong(3),
                rs.getBoolean(4), Sql.nullableDouble(rs, 5), rs.getString(6)), poolId);
    }

    /**
     * Each record ever queued in the pool, by row, with its entry in the first round that queued it:
     * the round, whether it was a spot check, and the model's belief before anyone labelled it.
     */
    public Map<Long, QueueEntry> firstQueued(long poolId) {
        Map<Long, QueueEntry> out = new HashMap<>();
        sql.list("read the queues of pool " + poolId, "SELECT " + COLUMNS + " FROM queue_entries q WHERE q.pool_id = ?"
                + " ORDER BY q.round_no, q.position", rs -> out.putIfAbsent(rs.getLong(3), entry(rs, null, null)), poolId);
        return out;
    }

    /**
     * The last resort of a desk with nothing left for a person while records remain: appends up to
     * {@value #RANDOM_APPEND} records that nobody labelled and the queue does not hold, as reserve
     * places without a score, to round {@code round}'s queue if it is still the one served. The pool
     * is searched in blocks of {@value #SEARCH_BLOCK} rows visited in a scattered order (a random
     * start, a random step prime to the block count), a few records from each, so they come from
     * all over the pool; at most {@value #MAX_PROBES} rows are looked at. The search holds no lock;
     * only the append does, briefly. Returns how many it appended.
     */
    int appendRandom(long poolId, int round) {
        long records = sql.first("read pool " + poolId, "SELECT record_count FROM pools WHERE id = ?",
                rs -> rs.getLong(1), poolId).orElse(0L);
        if (records == 0 || !servedRound(poolId).equals(Optional.of(round))) {
            return 0;
        }
        long blocks = (records + SEARCH_BLOCK - 1) / SEARCH_BLOCK;
        int perBlock = (int) Math.max(1, (RANDOM_APPEND + blocks - 1) / blocks);
        ThreadLocalRandom rng = ThreadLocalRandom.current();
        long start = rng.nextLong(blocks);
        long step = blocks == 1 ? 1 : 1 + rng.nextLong(blocks - 1);
        while (gcd(step, blocks) != 1) {
            step = step % (blocks - 1) + 1;
        }
        List<Long> found = new ArrayList<>();
        for (long k = 0; k < blocks && k * SEARCH_BLOCK < MAX_PROBES && found.size() < RANDOM_APPEND; k++) {
            long from = Math.floorMod(start + k * step, blocks) * SEARCH_BLOCK;
            long to = Math.min(records, from + SEARCH_BLOCK);
            Set<Long> taken = new HashSet<>(sql.list("look for records to add to the queue", "SELECT row_no FROM labels"
                    + " WHERE pool_id = ? AND row_no >= ? AND row_no < ? UNION SELECT row_no FROM queue_entries"
                    + " WHERE pool_id = ? AND round_no = ? AND row_no >= ? AND row_no < ?", rs -> rs.getLong(1),
                    poolId, from, to, poolId, round, from, to));
            List<Long> free = new ArrayList<>();
            for (long row = from; row < to; row++) {
                if (!taken.contains(row)) {
                    free.add(row);
                }
            }
            for (int i = 0; i < perBlock && !free.isEmpty() && found.size() < RANDOM_APPEND; i++) {
                found.add(free.remove(rng.nextInt(free.size())));
            }
        }
        if (found.isEmpty()) {
            return 0;
        }
        return sql.transaction("add records to the queue of pool " + poolId, c -> {
            Optional<Integer> served = Sql.first(c, "SELECT round_no FROM served_queues WHERE pool_id = ? FOR UPDATE",
                    rs -> rs.getInt(1), poolId);
            if (!served.equals(Optional.of(round))) {
                return 0;
            }
            // Labelled or queued since the search: left out.
            String in = String.join(", ", Collections.nCopies(found.size(), "?"));
            List<Object> args = new ArrayList<>(List.of(poolId));
            args.addAll(found);
            args.addAll(List.of(poolId, round));
            args.addAll(found);
            Set<Long> taken = new HashSet<>(Sql.list(c, "SELECT row_no FROM labels WHERE pool_id = ? AND row_no IN (" + in
                    + ") UNION SELECT row_no FROM queue_entries WHERE pool_id = ? AND round_no = ? AND row_no IN (" + in
                    + ")", rs -> rs.getLong(1), args.toArray()));
            int next = Sql.first(c, "SELECT COALESCE(MAX(position) + 1, 0) FROM queue_entries WHERE pool_id = ?"
                    + " AND round_no = ?", rs -> rs.getInt(1), poolId, round).orElse(0);
            List<QueueEntry> added = new ArrayList<>();
            for (long row : found) {
                if (!taken.contains(row)) {
                    added.add(new QueueEntry(round, next + added.size(), row, 0, false, null, null, null, 1, null, null,
                            true));
                }
            }
            insert(c, poolId, added);
            return added.size();
        });
    }
}
