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

    /**
     * Takes back the current label of the record at {@code row}, which must be {@code person}'s:
     * appends a withdrawal, after which the record is unlabelled. Returns the label taken back.
     */
    public LabelRow withdraw(long poolId, long row, String person) {
        try {
            return Transactions.run(ds, c -> {
                LabelRow newest;
                try (PreparedStatement q = c.prepareStatement("SELECT label, labelled_by, labelled_at, note, withdrawn"
                        + " FROM labels WHERE pool_id = ? AND row_no = ? ORDER BY id DESC FETCH FIRST ROW ONLY FOR UPDATE")) {
                    q.setLong(1, poolId);
                    q.setLong(2, row);
                    try (ResultSet rs = q.executeQuery()) {
                        if (!rs.next() || rs.getBoolean(5)) {
                            throw new ConflictException("the record has no label to take back");
                        }
                        newest = new LabelRow(row, rs.getString(1), rs.getString(2), rs.getTimestamp(3).toInstant(),
                                rs.getString(4));
                    }
                }
                if (!newest.labelledBy().equals(person)) {
                    throw new ConflictException("the record's label '" + newest.label() + "' was given by "
                            + newest.labelledBy() + "; only they can take it back");
                }
                try (PreparedStatement p = c.prepareStatement("INSERT INTO labels (pool_id, row_no, label, labelled_by,"
                        + " labelled_at, note, withdrawn) VALUES (?, ?, ?, ?, ?, ?, TRUE)")) {
                    p.setLong(1, poolId);
                    p.setLong(2, row);
                    p.setString(3, newest.label());
                    p.setString(4, person);
                    p.setTimestamp(5, Timestamp.from(clock.instant()));
                    p.setString(6, null);
                    p.executeUpdate();
                }
                return newest;
            });
        } catch (SQLException e) {
            throw new StoreException("cannot take back the label of row " + row + ": " + e.getMessage(), e);
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
             PreparedStatement q = c.prepareStatement("SELECT row_no, label, labelled_by, labelled_at, note, withdrawn"
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

    /**
     * Walks the current labels in row order: of several rows for one record, only the newest, and
     * nothing for a record whose newest row is a withdrawal.
     */
    static final class Cursor {

        private final ResultSet rs;
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
            while (true) {
                Stored newest = lookahead != null ? lookahead : read();
                lookahead = null;
                if (newest == null) {
                    return null;
                }
                Stored r;
                while ((r = read()) != null && r.label().row() == newest.label().row()) {
                    newest = r;
                }
                lookahead = r;
                if (!newest.withdrawn()) {
                    return newest.label();
                }
            }
        }

        /** The first stored row of the next record, already read. */
        private Stored lookahead;

        private record Stored(LabelRow label, boolean withdrawn) {
        }

        private Stored read() {
            try {
                if (!rs.next()) {
                    return null;
                }
                Timestamp at = rs.getTimestamp(4);
                return new Stored(new LabelRow(rs.getLong(1), rs.getString(2), rs.getString(3), at.toInstant(),
                        rs.getString(5)), rs.getBoolean(6));
            } catch (SQLException e) {
                throw new StoreException("cannot read labels: " + e.getMessage(), e);
            }
        }
    }
}
