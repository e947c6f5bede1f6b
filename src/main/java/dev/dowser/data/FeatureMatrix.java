package dev.dowser.data;

import dev.dowser.json.Json;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;

/**
 * A pool's standardised features in memory, float32, row-major: row i holds the pool's record
 * at place i. This is what the model reads.
 */
public record FeatureMatrix(float[] values, int rows, int cols, FeatureSchema schema) {

    /** Loads every record of the pool, encoding each raw blob with the pool's statistics. */
    public static FeatureMatrix load(Database db, String poolName) {
        PoolRow pool = db.pools().require(poolName);
        FeatureSchema schema = Json.read(pool.featureSchemaJson(), FeatureSchema.class);
        if (pool.recordCount() > Integer.MAX_VALUE) {
            throw new IllegalStateException("pool '" + poolName + "' has too many records to hold in memory");
        }
        int rows = (int) pool.recordCount();
        int cols = schema.encodedWidth();
        if ((long) rows * cols > Integer.MAX_VALUE - 16) {
            throw new IllegalStateException("pool '" + poolName + "' has " + rows + " x " + cols
                    + " features, more than one array can hold");
        }
        float[] values = new float[rows * cols];
        db.records().forEachFeatures(pool.id(), (row, bytes, offset, length) -> {
            int i = (int) row;
            schema.encode(bytes, offset, length, values, i * cols);
        });
        return new FeatureMatrix(values, rows, cols, schema);
    }

    public float get(int row, int col) {
        return values[row * cols + col];
    }

    /** The given rows of this matrix, in that order, row-major. */
    public float[] rows(int[] which) {
        return gather(values, cols, which);
    }

    /** The given rows of a row-major matrix of {@code cols} columns, in that order: the one way rows are gathered. */
    public static float[] gather(float[] x, int cols, int[] rows) {
        float[] out = new float[rows.length * cols];
        for (int i = 0; i < rows.length; i++) {
            System.arraycopy(x, rows[i] * cols, out, i * cols, cols);
        }
        return out;
    }
}
