package dev.dowser.data;

import dev.dowser.blas.RowMajor;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import java.util.ArrayList;
import java.util.List;

/**
 * A pool's labelled records as the model sees them: standardised features and class indices,
 * with each row's place in the pool.
 */
public record LabelledSet(float[] x, int[] labels, long[] poolRows, int cols, List<String> classes) {

    public LabelledSet {
        classes = List.copyOf(classes);
    }

    public int rows() {
        return labels.length;
    }

    /** The matrix's rows {@code rows} with class indices {@code labels}, in that order. */
    public static LabelledSet of(FeatureMatrix matrix, int[] rows, int[] labels, List<String> classes) {
        if (rows.length != labels.length) {
            throw new IllegalArgumentException(rows.length + " rows with " + labels.length + " labels");
        }
        return new LabelledSet(matrix.rows(rows), labels.clone(), java.util.Arrays.stream(rows).asLongStream().toArray(),
                matrix.cols(), classes);
    }

    /** Every record of the pool that has a current label in the label set, in pool order. */
    public static LabelledSet of(Database db, String poolName, FeatureMatrix matrix) {
        PoolRow pool = db.pools().require(poolName);
        List<String> classes = pool.classes();
        List<long[]> found = new ArrayList<>();
        db.labels().forEachCurrent(pool.id(), l -> {
            int k = classes.indexOf(l.label());
            if (k >= 0) {
                found.add(new long[] {l.row(), k});
            }
        });
        return of(matrix, found.stream().mapToInt(f -> (int) f[0]).toArray(),
                found.stream().mapToInt(f -> (int) f[1]).toArray(), classes);
    }

    /** The rows at the given indices of this set. */
    public LabelledSet subset(int[] which) {
        float[] sx = RowMajor.gather(x, cols, which);
        int[] sy = new int[which.length];
        long[] sr = new long[which.length];
        for (int i = 0; i < which.length; i++) {
            sy[i] = labels[which[i]];
            sr[i] = poolRows[which[i]];
        }
        return new LabelledSet(sx, sy, sr, cols, classes);
    }
}
