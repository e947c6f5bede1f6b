package dev.dowser.records;

import java.util.Arrays;

/**
 * A run of records on their way into a pool, shared by the importer and the pool writer without
 * copying: the reader puts each record's fields here (the characters of all fields side by side
 * in one array, so reading a field makes no object), the importer adds each record's id, label
 * and encoded features, and the writer's thread lays the batch out as one block and stores it.
 * A writer hands out a few batches and takes them back filled, so memory stays bounded.
 */
public final class RecordBatch {

    /** The length of a missing field. */
    public static final int MISSING = -1;
    /** Characters of text after which a batch counts as full, whatever its row count. */
    static final int TARGET_CHARS = 1 << 20;

    private final int cols;
    private final int capacity;
    private final int[] displayIndex;
    private final int[] start;
    private final int[] length;
    private final long[] lines;
    private final String[] keys;
    private final String[] labels;
    final int[] featureStart;
    final int[] featureLength;
    private char[] chars = new char[1 << 16];
    byte[] features = new byte[1 << 16];
    private int used;
    int featureUsed;
    private int rows;
    private int field;
    private int encoded;

    private RecordBatch(int cols, int[] displayIndex, int capacity) {
        this.cols = cols;
        this.capacity = capacity;
        this.displayIndex = displayIndex.clone();
        this.start = new int[cols * capacity];
        this.length = new int[cols * capacity];
        this.lines = new long[capacity];
        this.keys = new String[capacity];
        this.labels = new String[capacity];
        this.featureStart = new int[capacity];
        this.featureLength = new int[capacity];
    }

    /**
     * A batch to be stored: records of {@code cols} fields, those at {@code displayIndex} shown to
     * people, at most {@code capacity} of them.
     */
    public static RecordBatch forWriting(int cols, int[] displayIndex, int capacity) {
        return new RecordBatch(cols, displayIndex, capacity);
    }

    /** A batch that is only read back, never stored: the preview of a file's first records. */
    public static RecordBatch forReading(int cols, int capacity) {
        return new RecordBatch(cols, new int[0], capacity);
    }

    /** Empties the batch for reuse. */
    public void clear() {
        Arrays.fill(keys, 0, rows, null);
        Arrays.fill(labels, 0, rows, null);
        used = 0;
        featureUsed = 0;
        rows = 0;
        field = 0;
        encoded = 0;
    }

    /** True when no more records should be added: the batch will be stored as one block. */
    public boolean full() {
        return rows == capacity || used >= TARGET_CHARS;
    }

    public int rows() {
        return rows;
    }

    /** Starts a record; its fields follow, then {@link #endRecord}. */
    public void beginRecord(long line) {
        lines[rows] = line;
        field = 0;
    }

    /** Adds the next field of the current record; an empty field is missing. Past the last column it only counts. */
    public void field(char[] src, int off, int n) {
        if (field < cols) {
            int at = rows * cols + field;
            if (n == 0) {
                length[at] = MISSING;
            } else {
                ensure(n);
                System.arraycopy(src, off, chars, used, n);
                start[at] = used;
                length[at] = n;
                used += n;
            }
        }
        field++;
    }

    /** Adds the next field; null or empty is missing. */
    public void field(String s) {
        if (s == null || s.isEmpty()) {
            field(chars, 0, 0);
            return;
        }
        if (field < cols) {
            int n = s.length();
            ensure(n);
            s.getChars(0, n, chars, used);
            int at = rows * cols + field;
            start[at] = used;
            length[at] = n;
            used += n;
        }
        field++;
    }

    /** Fields given for the current record so far. */
    public int fieldsSoFar() {
        return field;
    }

    /** Sets the current record's line, when it is known only after its fields were read. */
    public void setLine(long line) {
        lines[rows] = line;
    }

    public void endRecord() {
        rows++;
    }

    private void ensure(int n) {
        if (used + n > chars.length) {
            chars = Arrays.copyOf(chars, Math.max(chars.length * 2, used + n));
        }
    }

    public long line(int row) {
        return lines[row];
    }

    public char[] chars() {
        return chars;
    }

    public int start(int row, int col) {
        return start[row * cols + col];
    }

    /** Length of the field, or {@link #MISSING}. */
    public int length(int row, int col) {
        return length[row * cols + col];
    }

    /** The field as a string, or null when missing. */
    public String text(int row, int col) {
        int n = length(row, col);
        return n == MISSING ? null : new String(chars, start(row, col), n);
    }

    /** Records read but not yet given their id, label and features by {@link #encoded}. */
    public int encodedRows() {
        return encoded;
    }

    /** Sets the next record's id, its carried label (or null) and its raw feature bytes. */
    public void encoded(String key, String label, byte[] raw, int rawLength) {
        int r = encoded++;
        keys[r] = key;
        labels[r] = label;
        if (featureUsed + rawLength > features.length) {
            features = Arrays.copyOf(features, Math.max(features.length * 2, featureUsed + rawLength));
        }
        System.arraycopy(raw, 0, features, featureUsed, rawLength);
        featureStart[r] = featureUsed;
        featureLength[r] = rawLength;
        featureUsed += rawLength;
    }

    /** The id given to record {@code row} by {@link #encoded}. */
    public String key(int row) {
        return keys[row];
    }

    /** The label record {@code row} carried in, or null. */
    public String label(int row) {
        return labels[row];
    }

    /** A copy of the raw feature bytes of encoded record {@code row}. */
    public byte[] features(int row) {
        return Arrays.copyOfRange(features, featureStart[row], featureStart[row] + featureLength[row]);
    }

    int displayCols() {
        return displayIndex.length;
    }

    /** Start of display value {@code c} of record {@code row}. */
    int displayStart(int row, int c) {
        return start[row * cols + displayIndex[c]];
    }

    /** Length of display value {@code c} of record {@code row}, or {@link #MISSING}. */
    int displayLength(int row, int c) {
        return length[row * cols + displayIndex[c]];
    }
}
