package dev.dowser.data;

import dev.dowser.records.RecordBatch;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.util.ArrayList;
import java.util.List;

/**
 * Reads a labelled CSV or JSON Lines file straight into memory as the model sees it, for the
 * commands that fit or simulate on a file: the same tokenizers, column roles, checks and feature
 * encoding as an import ({@link RecordEncoder}, {@link FeatureSchema}), so a file reads here exactly
 * as it would as a pool, without a database.
 */
public final class LabelledFiles {

    static final int BATCH_ROWS = 4_096;

    private LabelledFiles() {
    }

    /**
     * The records that carry a label in the label set, standardised, in file order; a bad line
     * fails with an {@link ImportException} naming it.
     */
    public static LabelledSet read(InputStream input, ImportSpec spec) {
        if (spec.labelColumn() == null) {
            throw new IllegalArgumentException("name the column that holds the labels (--label COL)");
        }
        CountingInput counted = new CountingInput(input, spec.maxBytes());
        try (RowReader reader = Importer.open(counted, spec)) {
            ColumnPlan plan = ColumnPlan.resolve(reader.header(), spec);
            RecordEncoder encoder = new RecordEncoder(plan, spec);
            List<byte[]> raw = new ArrayList<>();
            List<String> labels = new ArrayList<>();
            boolean more = true;
            while (more) {
                RecordBatch batch = RecordBatch.forReading(reader.header().size(), BATCH_ROWS);
                while (!batch.full() && (more = reader.next(batch))) {
                    encoder.accept(batch, batch.rows() - 1);
                }
                for (int i = 0; i < batch.rows(); i++) {
                    raw.add(batch.features(i));
                    labels.add(batch.label(i));
                }
            }
            if (raw.isEmpty()) {
                throw ImportException.of("the file has no records after its header");
            }
            FeatureSchema schema = encoder.schema();
            List<String> classes = encoder.classes();
            List<Integer> kept = new ArrayList<>();
            for (int i = 0; i < labels.size(); i++) {
                if (labels.get(i) != null && classes.contains(labels.get(i))) {
                    kept.add(i);
                }
            }
            if (kept.isEmpty()) {
                throw ImportException.of("the label column '" + spec.labelColumn() + "' holds no labels");
            }
            int cols = schema.encodedWidth();
            float[] x = new float[kept.size() * cols];
            int[] y = new int[kept.size()];
            long[] rows = new long[kept.size()];
            for (int k = 0; k < kept.size(); k++) {
                int i = kept.get(k);
                schema.encode(raw.get(i), x, k * cols);
                y[k] = classes.indexOf(labels.get(i));
                rows[k] = i;
            }
            return new LabelledSet(x, y, rows, cols, classes);
        } catch (IllegalArgumentException | UncheckedIOException e) {
            throw new ImportException(0, null, e.getMessage(), e);
        }
    }
}
