package dev.dowser.store;

import dev.dowser.labels.LabelEvent;
import dev.dowser.labels.LabelRow;
import dev.dowser.labels.Resolution;
import dev.dowser.labels.Verdict;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Clock;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Set;
import java.util.function.Consumer;

/**
 * Labels and reviews: appended, never changed in place or deleted, so the table is the history.
 * Each person's newest label row of a record is their opinion; how opinions and reviews give the
 * final label is {@link Resolution}'s rule.
 */
public final class LabelStore {

    public static final int MAX_LABELLER_CHARS = 100;
    public static final int MAX_NOTE_CHARS = 2_000;
    /** The kind of a person's label row; a review row's kind is its verdict's word. */
    public static final String KIND_LABEL = "label";

    private final Sql sql;
    private final Clock clock;

    LabelStore(Sql sql, Clock clock) {
        this.sql = sql;
        this.clock = clock;
    }

    /**
     * A label as it stands after {@link #add}: {@code appended} is false when the person's label of the
     * record already said exactly this (the same class and note), so nothing was written.
     */
    public record Added(LabelRow label, boolean appended) {
    }

    /**
     * Appends a label for the record at {@code row}; the caller has checked it against the label set.
     * The same label and note again from the same person, while their label stands, appends nothing: a
     * client that retries a label it never got the answer to (a 503, a dropped connection) must not
     * store it twice, and repeating one's opinion changes nothing.
     */
    public Added add(long poolId, long row, String label, String labelledBy, String note) {
        if (labelledBy == null || labelledBy.isBlank() || labelledBy.length() > MAX_LABELLER_CHARS) {
            throw new IllegalArgumentException("labelled_by must be 1 to " + MAX_LABELLER_CHARS + " characters");
        }
        if (note != null && note.length() > MAX_NOTE_CHARS) {
            throw new IllegalArgumentException("the note is longer than " + MAX_NOTE_CHARS + " characters");
        }
        return sql.transaction("store the label of row " + row, c -> {
            Resolution.Opinion standing = resolution(c, poolId, row).opinions().stream()
                    .filter(o -> o.person().equals(labelledBy)).findFirst().orElse(null);
            if (standing != null && standing.label().equals(label) && Objects.equals(standing.note(), note)) {
                return new Added(new LabelRow(row, label, labelledBy, standing.at(), note), false);
            }
            Instant at = insert(c, poolId, row, label, labelledBy, note, KIND_LABEL, false);
            return new Added(new LabelRow(row, label, labelledBy, at, note), true);
        });
    }

    /**
     * Takes back {@code person}'s label of the record at {@code row}: appends a withdrawal, after
     * which that person has no label on it. Returns the label taken back.
     */
    public LabelRow withdraw(long poolId, long row, String person) {
        return sql.transaction("take back the label of row " + row, c -> {
            Resolution now = resolution(c, poolId, row);
            Resolution.Opinion mine = now.opinions().stream().filter(o -> o.person().equals(person))
                    .findFirst().orElse(null);
            if (mine == null) {
                // The same words whether or not someone else labelled it: blind double labelling
                // must not learn another person's label, nor that there is one, from a refusal.
                throw new ConflictException("you have no label on this record to take back");
            }
            insert(c, poolId, row, mine.label(), person, null, KIND_LABEL, true);
            return new LabelRow(row, mine.label(), person, mine.at(), mine.note());
        });
    }

    /**
     * A reviewer's decision on the record at {@code row}: {@code accept} makes its current label
     * final (refused while people disagree: choose one with an override), {@code override} sets
     * {@code label} with a {@code reason}. Appended like every label; the newest review is in force.
     */
    public Resolution review(long poolId, long row, String reviewer, Verdict verdict, String label, String reason) {
        if (verdict == Verdict.OVERRIDE && (reason == null || reason.isBlank())) {
            throw new IllegalArgumentException("an override needs a reason, kept with the label");
        }
        if (reason != null && reason.length() > MAX_NOTE_CHARS) {
            throw new IllegalArgumentException("the reason is longer than " + MAX_NOTE_CHARS + " characters");
        }
        return sql.transaction("store the review of row " + row, c -> {
            Resolution now = resolution(c, poolId, row);
            String finalLabel = label;
            if (verdict == Verdict.ACCEPT) {
                if (now.opinions().isEmpty()) {
                    throw new ConflictException("the record has no label to accept");
                }
                if (now.peopleDisagree()) {
                    throw new ConflictException("people disagree on this record; override it with the label"
                            + " you choose and a reason");
                }
                finalLabel = now.opinions().get(0).label();
            }
            insert(c, poolId, row, finalLabel, reviewer, reason, verdict.word(), false);
            return resolution(c, poolId, row);
        });
    }

    /**
     * The newest labels of {@code person} in the pool that still stand (not taken back, not replaced
     * by their own later label), newest first, at most {@code limit}.
     */
    public List<LabelRow> latestBy(long poolId, String person, int limit) {
        // Newest first along the index labels_by_person; each record's first row seen is the person's newest on it.
        return sql.scan("read the labels of " + person, "SELECT row_no, label, labelled_at, note, withdrawn FROM labels"
                + " WHERE pool_id = ? AND labelled_by = ? AND kind = '" + KIND_LABEL + "'"
                + " ORDER BY pool_id DESC, labelled_by DESC, id DESC", 64, rs -> {
                    List<LabelRow> out = new ArrayList<>();
                    Set<Long> seen = new HashSet<>();
                    while (out.size() < limit && rs.next()) {
                        long row = rs.getLong(1);
                        if (seen.add(row) && !rs.getBoolean(5)) {
                            out.add(new LabelRow(row, rs.getString(2), person, Sql.instant(rs, 3), rs.getString(4)));
                        }
                    }
                    return out;
                }, poolId, person);
    }

    /** One stored row of a record's label history, oldest first: labels, withdrawals and reviews. */
    public record Entry(String kind, String label, String by, Instant at, String note, boolean withdrawn) {
    }

    /** Everything ever said about the record at {@code row}, oldest first. */
    public List<Entry> history(long poolId, long row) {
        return sql.list("read the history of row " + row, "SELECT kind, label, labelled_by, labelled_at, note, withdrawn"
                + " FROM labels WHERE pool_id = ? AND row_no = ? ORDER BY id", rs -> new Entry(rs.getString(1),
                rs.getString(2), rs.getString(3), Sql.instant(rs, 4), rs.getString(5), rs.getBoolean(6)), poolId, row);
    }

    /** Where the labels of the record at {@code row} stand. */
    public Resolution resolution(long poolId, long row) {
        return sql.connected("read the labels of row " + row, c -> resolution(c, poolId, row));
    }

    /** The record's labels as they stand, its label rows locked until the transaction ends. */
    private static Resolution resolution(Connection c, long poolId, long row) throws SQLException {
        return Sql.scan(c, "SELECT " + CURSOR_COLUMNS + " FROM labels WHERE pool_id = ? AND row_no = ? ORDER BY id"
                + " FOR UPDATE", 64, rs -> {
                    Resolution r = new Cursor(rs).next();
                    return r != null ? r : new Resolution(row, List.of(), null);
                }, poolId, row);
    }

    /** Appends one label row and brings the record's queue entries up to date with it; returns its time. */
    private Instant insert(Connection c, long poolId, long row, String label, String by, String note, String kind,
                           boolean withdrawn) throws SQLException {
        Instant now = clock.instant();
        Sql.update(c, "INSERT INTO labels (pool_id, row_no, label, labelled_by, labelled_at, note, kind, withdrawn)"
                + " VALUES (?, ?, ?, ?, ?, ?, ?, ?)", poolId, row, label, by, now, note, kind, withdrawn);
        // The author has acted on the record: their lease on it ends, and its entries' done flags follow
        // the labels (a record wanted by two people is then free for the second at once).
        Sql.update(c, "DELETE FROM leases WHERE pool_id = ? AND row_no = ? AND person = ?", poolId, row, by);
        Sql.update(c, QueueStore.REFRESH_DONE, now, poolId, row);
        return now;
    }

    /** Records that someone has a label on, or that a reviewer decided. */
    public long labelledRecords(long poolId) {
        return sql.first("count the labelled records of pool " + poolId, "SELECT COUNT(DISTINCT l.row_no)"
                + " FROM labels l WHERE l.pool_id = ? AND (l.kind <> 'label' OR (NOT l.withdrawn AND NOT EXISTS"
                + " (SELECT 1 FROM labels w WHERE w.pool_id = l.pool_id AND w.row_no = l.row_no AND w.kind = 'label'"
                + " AND w.labelled_by = l.labelled_by AND w.id > l.id)))", rs -> rs.getLong(1), poolId).orElse(0L);
    }

    /** Records per final label; classes with no records are left to the caller. */
    public Map<String, Long> counts(long poolId) {
        Map<String, Long> counts = new LinkedHashMap<>();
        forEachCurrent(poolId, l -> counts.merge(l.label(), 1L, Long::sum));
        return counts;
    }

    /** The final label of every record that has one, in row order, without reading the records. */
    public void forEachCurrent(long poolId, Consumer<LabelRow> sink) {
        forEachCurrent(poolId, 0, Long.MAX_VALUE, sink);
    }

    /** The final label of each record with row in [from, to) that has one, in row order. */
    void forEachCurrent(long poolId, long from, long to, Consumer<LabelRow> sink) {
        forEachResolution(poolId, from, to, r -> {
            LabelRow l = r.finalLabel();
            if (l != null) {
                sink.accept(l);
            }
        });
    }

    /** Every record anyone has labelled (resolved or not), in row order. */
    public void forEachResolution(long poolId, Consumer<Resolution> sink) {
        forEachResolution(poolId, 0, Long.MAX_VALUE, sink);
    }

    /**
     * Every record anyone had labelled once the label rows up to id {@code lastLabelId} were
     * written, as those rows resolve it: label rows are appended, never changed, so this is the
     * labelled set as it stood then.
     */
    public void forEachResolutionUpTo(long poolId, long lastLabelId, Consumer<Resolution> sink) {
        withCursor(poolId, 0, Long.MAX_VALUE, lastLabelId, cursor -> {
            for (Resolution r = cursor.next(); r != null; r = cursor.next()) {
                sink.accept(r);
            }
        });
    }

    /** The id of the pool's newest label row (labels, withdrawals and reviews alike); 0 when there is none. */
    public long lastLabelId(long poolId) {
        return sql.first("read the labels of pool " + poolId, "SELECT COALESCE(MAX(id), 0) FROM labels WHERE pool_id = ?",
                rs -> rs.getLong(1), poolId).orElse(0L);
    }

    void forEachResolution(long poolId, long from, long to, Consumer<Resolution> sink) {
        withCursor(poolId, from, to, cursor -> {
            for (Resolution r = cursor.next(); r != null; r = cursor.next()) {
                sink.accept(r);
            }
        });
    }

    void withResolutionCursor(long poolId, Consumer<Cursor> use) {
        withCursor(poolId, 0, Long.MAX_VALUE, use);
    }

    private static final String CURSOR_COLUMNS = "row_no, label, labelled_by, labelled_at, note, withdrawn, kind";

    private void withCursor(long poolId, long from, long to, Consumer<Cursor> use) {
        withCursor(poolId, from, to, Long.MAX_VALUE, use);
    }

    private void withCursor(long poolId, long from, long to, long lastId, Consumer<Cursor> use) {
        sql.scan("read the labels of pool " + poolId, "SELECT " + CURSOR_COLUMNS + " FROM labels WHERE pool_id = ?"
                + " AND row_no >= ? AND row_no < ? AND id <= ? ORDER BY row_no, id", 4_096, rs -> {
                    use.accept(new Cursor(rs));
                    return null;
                }, poolId, from, to, lastId);
    }

    /**
     * Walks the labelled records in row order, gathering each one's rows (oldest first) and
     * folding them by {@link Resolution#fold}. Records left with neither opinion nor review are skipped.
     */
    static final class Cursor {

        private final ResultSet rs;
        private Resolution current;
        /** The first stored row of the next record, already read. */
        private LabelEvent lookahead;

        Cursor(ResultSet rs) {
            this.rs = rs;
        }

        Resolution peek() {
            if (current == null) {
                current = fold();
            }
            return current;
        }

        Resolution next() {
            Resolution c = peek();
            current = null;
            return c;
        }

        private Resolution fold() {
            while (true) {
                LabelEvent first = lookahead != null ? lookahead : read();
                lookahead = null;
                if (first == null) {
                    return null;
                }
                List<LabelEvent> events = new ArrayList<>();
                LabelEvent e = first;
                while (e != null && e.row() == first.row()) {
                    events.add(e);
                    e = read();
                }
                lookahead = e;
                Resolution r = Resolution.fold(first.row(), events);
                if (!r.empty()) {
                    return r;
                }
            }
        }

        private LabelEvent read() {
            try {
                return rs.next() ? event(rs) : null;
            } catch (SQLException e) {
                throw new StoreException("cannot read labels: " + e.getMessage(), e);
            }
        }
    }

    /** A label row read from the columns of {@link #CURSOR_COLUMNS}. */
    static LabelEvent event(ResultSet rs) throws SQLException {
        String kind = rs.getString(7);
        return new LabelEvent(rs.getLong(1), rs.getString(2), rs.getString(3), Sql.instant(rs, 4),
                rs.getString(5), rs.getBoolean(6), kind.equals(KIND_LABEL) ? null : Verdict.parse(kind));
    }
}
