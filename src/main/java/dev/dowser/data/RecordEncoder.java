package dev.dowser.data;

import dev.dowser.records.RecordBatch;

import java.nio.BufferOverflowException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;

/**
 * The per-record work of an import: checks the id and label, encodes the features while
 * learning their statistics, and checks the size of the display values. Used by one thread.
 */
final class RecordEncoder {

    /** Largest raw feature blob of one record. */
    static final int MAX_FEATURE_BYTES = 1_000_000;
    /** Most characters of display values one record may carry. */
    static final int MAX_DISPLAY_CHARS = 1_000_000;

    private final ColumnPlan plan;
    private final ImportSpec spec;
    private final List<ColumnStats> stats = new ArrayList<>();
    private final Set<String> classSet;
    private final ByteBuffer raw = ByteBuffer.allocate(MAX_FEATURE_BYTES).order(ByteOrder.LITTLE_ENDIAN);
    private long labelled;

    RecordEncoder(ColumnPlan plan, ImportSpec spec) {
        this.plan = plan;
        this.spec = spec;
        this.classSet = new LinkedHashSet<>(spec.classes());
        Set<String> categorical = new java.util.HashSet<>(spec.categorical());
        for (String f : plan.roles().features()) {
            stats.add(new ColumnStats(f, categorical.contains(f), spec.maxLevels(), spec.missingTokens()));
        }
    }

    /** Checks and encodes record {@code row} of the batch, which must be its next unencoded one. */
    void accept(RecordBatch b, int row) {
        long line = b.line(row);
        String key = plan.idIndex() < 0 ? Long.toString(line) : checkKey(b.text(row, plan.idIndex()), line);
        String label = plan.labelIndex() < 0 ? null : label(b.text(row, plan.labelIndex()), line);
        raw.clear();
        try {
            int[] fi = plan.featureIndex();
            for (int i = 0; i < fi.length; i++) {
                stats.get(i).accept(b, row, fi[i], raw);
            }
        } catch (BufferOverflowException e) {
            throw new ImportException(line, null, "the features of this record take more than "
                    + MAX_FEATURE_BYTES + " bytes");
        }
        int[] di = plan.displayIndex();
        long chars = 0;
        for (int c : di) {
            chars += Math.max(0, b.length(row, c));
        }
        if (chars > MAX_DISPLAY_CHARS) {
            throw new ImportException(line, null, "the display fields take " + chars
                    + " characters, more than the limit of " + MAX_DISPLAY_CHARS + "; show fewer columns");
        }
        if (label != null) {
            labelled++;
        }
        b.encoded(key, label, raw.array(), raw.position());
    }

    private String checkKey(String key, long line) {
        if (key == null || key.isBlank()) {
            throw new ImportException(line, spec.idColumn(), "the id is empty; every record needs an id");
        }
        if (key.length() > ImportSpec.MAX_KEY_CHARS) {
            throw new ImportException(line, spec.idColumn(), "the id is longer than " + ImportSpec.MAX_KEY_CHARS
                    + " characters");
        }
        return key;
    }

    private String label(String value, long line) {
        if (value == null || value.isBlank()) {
            return null;
        }
        String label = value.strip();
        if (!spec.classes().isEmpty()) {
            if (!classSet.contains(label)) {
                throw new ImportException(line, spec.labelColumn(), "'" + label + "' is not one of the classes "
                        + String.join(", ", spec.classes()));
            }
            return label;
        }
        if (label.length() > ImportSpec.MAX_KEY_CHARS) {
            throw new ImportException(line, spec.labelColumn(), "the label is longer than "
                    + ImportSpec.MAX_KEY_CHARS + " characters");
        }
        if (classSet.add(label) && classSet.size() > ImportSpec.MAX_CLASSES) {
            throw new ImportException(line, spec.labelColumn(), "more than " + ImportSpec.MAX_CLASSES
                    + " distinct labels; is this the right label column?");
        }
        return label;
    }

    long labelled() {
        return labelled;
    }

    /** The label set: as given, or the labels seen, ordered. */
    List<String> classes() {
        return spec.classes().isEmpty() ? LabelOrder.sorted(classSet) : spec.classes();
    }

    FeatureSchema schema() {
        List<FeatureColumn> columns = new ArrayList<>();
        for (ColumnStats s : stats) {
            columns.add(s.finish());
        }
        return new FeatureSchema(columns);
    }
}
