package dev.dowser.store;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Timestamp;
import java.time.Clock;
import java.time.Instant;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.function.Consumer;
import javax.sql.DataSource;

/**
 * Labels: appended, never changed in place. The newest label row of a record is its label.
 */
public final class LabelStore {

    public static final int MAX_LABELLER_CHARS = 100;
    public static final int MAX_NOTE_CHARS = 2_000;

    private final DataSource ds;
    private final Clock clock;

    LabelStore(DataSource ds, Clock clock) {
        this.ds = ds;
        this.clock = clock;
    }

    /** Appends a label for the record at {@code row}; the caller has checked it against the label set. */
    public LabelRow add(long poolId, long row, String label, String labelledBy, String note) {
        if (labelledBy == null || labelledBy.isBlank() || labelledBy.length() > MAX_LABELLER_CHARS) {
            throw new IllegalArgumentException("labelled_by must be 1 to " + MAX_LABELLER_CHARS + " characters");
        }
        if (note != null && note.length() > MAX_NOTE_CHARS) {
            throw new IllegalArgumentException("the note is longer than " + MAX_NOTE_CHARS + " characters");
        }
        Instant now = clock.instant();
        try (Connection c = ds.getConnection();
             PreparedStatement p = c.prepareStatement("INSERT INTO labels"
                     + " (pool_id, row_no, label, labelled_by, labelled_at, note) VALUES (?, ?, ?, ?, ?, ?)")) {
            p.setLong(1, poolId);
            p.setLong(2, row);
            p.setString(3, label);
            p.setString(4, labelledBy);
            p.setTimestamp(5, Timestamp.from(now));
            p.setString(6, note);
            p.executeUpdate();
            return new LabelRow(row, label, labelledBy, now, note);
        } catch (SQLException e) {
            throw new StoreException("cannot store the label of row " + row + ": " + e.getMessage(), e);
        }
    }

    /** Records per current label; classes with no records are left to the caller. */
    public Map<String, Long> counts(long poolId) {
        Map<String, Long> counts = new LinkedHashMap<>();
        forEachCurrent(poolId, l -> counts.merge(l.label(), 1L, Long::sum));
        return counts;
    }

    /** The current label of every labelled record of the pool, in row order, without reading the records. */
    public void forEachCurrent(long poolId, Consumer<LabelRow> sink) {
        forEachCurrent(poolId, 0, Long.MAX_VALUE, sink);
    }

    /** The current label of each labelled record with row in [from, to), in row order. */
    void forEachCurrent(long poolId, long from, long to, Consumer<LabelRow> sink) {
        withCursor(poolId, from, to, cursor -> {
            for (LabelRow l = cursor.next(); l != null; l = cursor.next()) {
                sink.accept(l);
            }
        });
    }

    void withCurrentCursor(long poolId, Consumer<Cursor> use) {
        withCursor(poolId, 0, Long.MAX_VALUE, use);
    }

    private void withCursor(long poolId, long from, long to, Consumer<Cursor> use) {
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT row_no, label, labelled_by, labelled_at, note"
                     + " FROM labels WHERE pool_id = ? AND row_no >= ? AND row_no < ? ORDER BY row_no, id")) {
            q.setFetchSize(4_096);
            q.setLong(1, poolId);
            q.setLong(2, from);
            q.setLong(3, to);
            try (ResultSet rs = q.executeQuery()) {
                use.accept(new Cursor(rs));
            }
        } catch (SQLException e) {
            throw new StoreException("cannot read the labels of pool " + poolId + ": " + e.getMessage(), e);
        }
    }

    /** Walks the current labels in row order: of several rows for one record, only the newest. */
    static final class Cursor {

        private final ResultSet rs;
        /** The first stored row of the next record, already read. */
        private LabelRow lookahead;
        /** The next record's newest label, once worked out. */
        private LabelRow current;

        Cursor(ResultSet rs) {
            this.rs = rs;
        }

        LabelRow peek() {
            if (current == null) {
                current = collapse();
            }
            return current;
        }

        LabelRow next() {
            LabelRow c = peek();
            current = null;
            return c;
        }

        private LabelRow collapse() {
            LabelRow newest = lookahead != null ? lookahead : read();
            lookahead = null;
            if (newest == null) {
                return null;
            }
            LabelRow r;
            while ((r = read()) != null && r.row() == newest.row()) {
                newest = r;
            }
            lookahead = r;
            return newest;
        }

        private LabelRow read() {
            try {
                if (!rs.next()) {
                    return null;
                }
                Timestamp at = rs.getTimestamp(4);
                return new LabelRow(rs.getLong(1), rs.getString(2), rs.getString(3), at.toInstant(),
                        rs.getString(5));
            } catch (SQLException e) {
                throw new StoreException("cannot read labels: " + e.getMessage(), e);
            }
        }
    }
}
