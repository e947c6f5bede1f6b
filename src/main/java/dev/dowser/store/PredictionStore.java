package dev.dowser.store;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.util.Arrays;
import java.util.Optional;

/**
 * The model's posterior predictive for each labelled record after the latest round: derived data,
 * replaced whole by each round, read by the review page to find records where a confident model
 * disagrees with the people. Kept as one row a pool (rows and probabilities packed), so a round
 * with tens of thousands of labelled records writes one row, not one each.
 */
public final class PredictionStore {

    /** A round's predictions: {@code rows} ascending, {@code probabilities} rows x classes. */
    public record Predictions(int round, long[] rows, float[] probabilities, int classes) {

        public Predictions {
            if (probabilities.length != (long) rows.length * classes) {
                throw new IllegalArgumentException(rows.length + " rows of " + classes + " classes need "
                        + (long) rows.length * classes + " probabilities, not " + probabilities.length);
            }
        }

        /** The class probabilities of the record at {@code row}, or null when it has none. */
        public double[] of(long row) {
            int i = Arrays.binarySearch(rows, row);
            if (i < 0) {
                return null;
            }
            double[] p = new double[classes];
            for (int c = 0; c < classes; c++) {
                p[c] = probabilities[i * classes + c];
            }
            return p;
        }
    }

    /** A round's predicted class for each record of the pool's stop set ({@code rows} ascending). */
    public record StopSetClasses(int round, long[] rows, int[] classes) {

        public StopSetClasses {
            if (rows.length != classes.length) {
                throw new IllegalArgumentException(rows.length + " stop-set rows with " + classes.length + " classes");
            }
        }
    }

    private final Sql sql;

    PredictionStore(Sql sql) {
        this.sql = sql;
    }

    /** Replaces the pool's predictions with {@code p}. */
    public void replace(long poolId, Predictions p) {
        ByteBuffer probs = ByteBuffer.allocate(p.probabilities().length * Float.BYTES).order(ByteOrder.LITTLE_ENDIAN);
        probs.asFloatBuffer().put(p.probabilities());
        replace("store the predictions of round " + p.round(), "labelled_predictions", "INSERT INTO labelled_predictions"
                + " (pool_id, round_no, class_count, row_nos, probabilities) VALUES (?, ?, ?, ?, ?)", poolId, p.round(),
                p.classes(), packRows(p.rows()), probs.array());
    }

    /**
     * The pool's one row of {@code table} replaced in one transaction: delete, then insert. (H2's
     * MERGE ... KEY, used here before, is not SQL that PostgreSQL reads.)
     */
    private void replace(String what, String table, String insert, long poolId, Object... values) {
        sql.transaction(what, c -> {
            Sql.update(c, "DELETE FROM " + table + " WHERE pool_id = ?", poolId);
            Object[] args = new Object[values.length + 1];
            args[0] = poolId;
            System.arraycopy(values, 0, args, 1, values.length);
            return Sql.update(c, insert, args);
        });
    }

    /** The pool's latest predictions, if a round has made any. */
    public Optional<Predictions> latest(long poolId) {
        return sql.first("read the predictions of pool " + poolId, "SELECT round_no, class_count, row_nos, probabilities"
                + " FROM labelled_predictions WHERE pool_id = ?", rs -> {
                    ByteBuffer probBytes = ByteBuffer.wrap(rs.getBytes(4)).order(ByteOrder.LITTLE_ENDIAN);
                    float[] probs = new float[probBytes.remaining() / Float.BYTES];
                    probBytes.asFloatBuffer().get(probs);
                    return new Predictions(rs.getInt(1), unpackRows(rs.getBytes(3)), probs, rs.getInt(2));
                }, poolId);
    }

    /** Replaces the pool's stop-set predictions with those of round {@code p.round()}. */
    public void replaceStopSet(long poolId, StopSetClasses p) {
        ByteBuffer classes = ByteBuffer.allocate(p.classes().length * Integer.BYTES).order(ByteOrder.LITTLE_ENDIAN);
        classes.asIntBuffer().put(p.classes());
        replace("store the stop-set predictions of round " + p.round(), "stop_set_predictions", "INSERT INTO"
                + " stop_set_predictions (pool_id, round_no, row_nos, classes) VALUES (?, ?, ?, ?)", poolId, p.round(),
                packRows(p.rows()), classes.array());
    }

    /** The latest round's stop-set predictions, if a round has made any. */
    public Optional<StopSetClasses> latestStopSet(long poolId) {
        return sql.first("read the stop-set predictions of pool " + poolId, "SELECT round_no, row_nos, classes"
                + " FROM stop_set_predictions WHERE pool_id = ?", rs -> {
                    ByteBuffer classBytes = ByteBuffer.wrap(rs.getBytes(3)).order(ByteOrder.LITTLE_ENDIAN);
                    int[] classes = new int[classBytes.remaining() / Integer.BYTES];
                    classBytes.asIntBuffer().get(classes);
                    return new StopSetClasses(rs.getInt(1), unpackRows(rs.getBytes(2)), classes);
                }, poolId);
    }

    /** Row numbers as int64 little-endian, as both tables keep them. */
    private static byte[] packRows(long[] rows) {
        ByteBuffer b = ByteBuffer.allocate(rows.length * Long.BYTES).order(ByteOrder.LITTLE_ENDIAN);
        b.asLongBuffer().put(rows);
        return b.array();
    }

    private static long[] unpackRows(byte[] bytes) {
        ByteBuffer b = ByteBuffer.wrap(bytes).order(ByteOrder.LITTLE_ENDIAN);
        long[] rows = new long[b.remaining() / Long.BYTES];
        b.asLongBuffer().get(rows);
        return rows;
    }
}
