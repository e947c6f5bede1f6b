package dev.dowser.data;

import dev.dowser.blas.RowMajor;
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
        float[] values = allocate(poolName, rows, cols);
        db.records().forEachFeatures(pool.id(), (row, bytes, offset, length) -> {
            int i = (int) row;
            schema.encode(bytes, offset, length, values, i * cols);
        });
        return new FeatureMatrix(values, rows, cols, schema);
    }

    /**
     * The matrix's array, or a message with its size when the heap cannot hold it. One allocation
     * that did not fit touched nothing else, so the round fails with that message and the server
     * serves on (without it, the error left the round "running" and the next one ran out the same way).
     */
    private static float[] allocate(String poolName, int rows, int cols) {
        try {
            return new float[rows * cols];
        } catch (OutOfMemoryError e) {
            long mib = ((long) rows * cols * Float.BYTES + (1 << 20) - 1) >> 20;
            long heapMib = Runtime.getRuntime().maxMemory() >> 20;
            long suggestGib = Math.max(1, (3 * mib + 1023) / 1024);
            throw new IllegalStateException(String.format(java.util.Locale.ROOT, "pool '%s' needs %,d MiB to hold its"
                    + " %,d records x %d features in memory, more than this server's heap of %,d MiB has free; start"
                    + " the server with a larger heap (about three times that, the matrix and its working copies:"
                    + " java -Xmx%dg -jar dowser.jar serve, or DOWSER_JAVA_OPTS=-Xmx%dg ./dowser serve)",
                    poolName, mib, rows, cols, heapMib, suggestGib, suggestGib));
        }
    }

    public float get(int row, int col) {
        return values[row * cols + col];
    }

    /** The given rows of this matrix, in that order, row-major. */
    public float[] rows(int[] which) {
        return RowMajor.gather(values, cols, which);
    }
}
