package dev.dowser.data;

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
        int cols = matrix.cols();
        float[] x = new float[found.size() * cols];
        int[] labels = new int[found.size()];
        long[] rows = new long[found.size()];
        for (int i = 0; i < found.size(); i++) {
            rows[i] = found.get(i)[0];
            labels[i] = (int) found.get(i)[1];
            System.arraycopy(matrix.values(), (int) rows[i] * cols, x, i * cols, cols);
        }
        return new LabelledSet(x, labels, rows, cols, classes);
    }

    /** The rows at the given indices of this set. */
    public LabelledSet subset(int[] which) {
        float[] sx = new float[which.length * cols];
        int[] sy = new int[which.length];
        long[] sr = new long[which.length];
        for (int i = 0; i < which.length; i++) {
            System.arraycopy(x, which[i] * cols, sx, i * cols, cols);
            sy[i] = labels[which[i]];
            sr[i] = poolRows[which[i]];
        }
        return new LabelledSet(sx, sy, sr, cols, classes);
    }
}
