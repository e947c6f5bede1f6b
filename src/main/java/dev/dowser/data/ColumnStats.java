package dev.dowser.data;

import dev.dowser.records.RecordBatch;

import java.nio.ByteBuffer;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * Learns one feature column while the file streams past: its kind (from its first value), its
 * categorical levels, and its means and variances, in bounded memory. Moments are summed about
 * the column's first value (the shifted-data algorithm, Chan, Golub & LeVeque 1983), which is as
 * stable as Welford's update for data whose spread is small beside its offset, without a division
 * per value.
 */
final class ColumnStats {

    private final String name;
    private final int maxLevels;
    private final java.util.Set<String> missingTokens;
    private FeatureKind kind;
    private long kindLine;
    private int dims;
    private final Map<String, Integer> levelIndex = new HashMap<>();
    private final List<String> levels = new ArrayList<>();
    private long[] levelCounts = new long[0];
    private long count;
    private long missing;
    private double[] shift;
    private double[] sum;
    private double[] sumSq;
    private double low = Double.POSITIVE_INFINITY;
    private double high = Double.NEGATIVE_INFINITY;

    ColumnStats(String name, boolean categorical, int maxLevels) {
        this(name, categorical, maxLevels, List.of());
    }

    ColumnStats(String name, boolean categorical, int maxLevels, List<String> missingTokens) {
        this.name = name;
        this.maxLevels = maxLevels;
        this.missingTokens = java.util.Set.copyOf(missingTokens);
        if (categorical) {
            setKind(FeatureKind.CATEGORICAL, 1, 0);
        }
    }

    private void setKind(FeatureKind k, int d, long line) {
        kind = k;
        dims = d;
        kindLine = line;
        shift = new double[d];
        sum = new double[d];
        sumSq = new double[d];
    }

    /**
     * Adds one field of a batch (absent, blank or a missing token counts as missing) and writes its
     * raw floats to {@code out}.
     */
    void accept(RecordBatch batch, int row, int col, ByteBuffer out) {
        int len = batch.length(row, col);
        char[] a = batch.chars();
        int from = batch.start(row, col);
        if (len == RecordBatch.MISSING || isBlank(a, from, from + len) || isMissingToken(a, from, len)) {
            missing++;
            out.putFloat(Float.NaN);
            return;
        }
        long line = batch.line(row);
        if (kind == null) {
            decideKind(new String(a, from, len), line);
        }
        switch (kind) {
            case NUMERIC -> {
                float x = number(a, from, from + len, line);
                moments(0, x);
                out.putFloat(x);
            }
            case CATEGORICAL -> out.putFloat(level(new String(a, from, len).strip(), line));
            case EMBEDDING -> embedding(a, from, from + len, line, out);
        }
        count++;
    }

    /** Whether the field, trimmed, is one of the missing tokens; short fields only, so no string for most values. */
    private boolean isMissingToken(char[] a, int from, int len) {
        if (missingTokens.isEmpty() || len > 16) {
            return false;
        }
        return missingTokens.contains(new String(a, from, len).strip());
    }

    private static boolean isBlank(char[] a, int from, int to) {
        for (int i = from; i < to; i++) {
            if (!Character.isWhitespace(a[i])) {
                return false;
            }
        }
        return true;
    }

    private void decideKind(String value, long line) {
        String v = value.strip();
        if (v.startsWith("[")) {
            int d = countElements(v);
            if (d == 0) {
                throw new ImportException(line, name, "an embedding must hold at least one number");
            }
            setKind(FeatureKind.EMBEDDING, d, line);
        } else if (NumberText.looksNumeric(v) || NumberText.looksNonFinite(v)) {
            setKind(FeatureKind.NUMERIC, 1, line);
        } else {
            setKind(FeatureKind.CATEGORICAL, 1, line);
        }
    }

    private float number(char[] a, int from, int to, long line) {
        double x = NumberText.parse(a, from, to);
        if (Double.isNaN(x)) {
            String value = new String(a, from, to - from);
            if (NumberText.looksNonFinite(value)) {
                throw new ImportException(line, name, "'" + value.strip() + "' is not a finite number;"
                        + " leave the field empty for a missing value");
            }
            throw new ImportException(line, name, "expected a number, got '" + shorten(value) + "' (the column holds"
                    + " numbers from line " + kindLine + "); if the column is categorical, list it among the categorical"
                    + " columns (--categorical)");
        }
        if (Double.isInfinite(x) || Math.abs(x) > Float.MAX_VALUE) {
            throw new ImportException(line, name, "'" + shorten(new String(a, from, to - from))
                    + "' is too large for a 32-bit feature");
        }
        return (float) x;
    }

    private int level(String value, long line) {
        Integer at = levelIndex.get(value);
        if (at == null) {
            if (levels.size() >= maxLevels) {
                throw new ImportException(line, name, "more than " + maxLevels + " distinct values; a categorical"
                        + " feature may have at most " + maxLevels + " (raise the level limit, or leave the column"
                        + " out of the features)");
            }
            at = levels.size();
            levelIndex.put(value, at);
            levels.add(value);
            levelCounts = java.util.Arrays.copyOf(levelCounts, levels.size());
        }
        levelCounts[at]++;
        return at;
    }

    private void embedding(char[] a, int from, int to, long line, ByteBuffer out) {
        while (from < to && a[from] == ' ') {
            from++;
        }
        while (to > from && a[to - 1] == ' ') {
            to--;
        }
        if (to - from < 2 || a[from] != '[' || a[to - 1] != ']') {
            throw new ImportException(line, name, "expected a JSON array of " + dims + " numbers, got '"
                    + shorten(new String(a, from, to - from)) + "'");
        }
        int start = from + 1;
        int end = to - 1;
        int d = 0;
        if (isBlank(a, start, end)) {
            throw raggedEmbedding(line, 0);
        }
        while (start <= end) {
            int comma = start;
            while (comma < end && a[comma] != ',') {
                comma++;
            }
            if (d >= dims) {
                throw raggedEmbedding(line, countElements(new String(a, from, to - from)));
            }
            float x = number(a, start, comma, line);
            moments(d, x);
            out.putFloat(x);
            d++;
            start = comma + 1;
        }
        if (d != dims) {
            throw raggedEmbedding(line, d);
        }
    }

    private ImportException raggedEmbedding(long line, int got) {
        return new ImportException(line, name, "the embedding has " + got + " numbers where line " + kindLine
                + " set its length to " + dims);
    }

    private static int countElements(String array) {
        String inner = array.substring(1, Math.max(1, array.length() - 1)).strip();
        if (inner.isEmpty()) {
            return 0;
        }
        int n = 1;
        for (int i = 0; i < inner.length(); i++) {
            if (inner.charAt(i) == ',') {
                n++;
            }
        }
        return n;
    }

    private void moments(int d, double x) {
        if (count == 0) {
            shift[d] = x;
        }
        double y = x - shift[d];
        sum[d] += y;
        sumSq[d] += y * y;
        low = Math.min(low, x);
        high = Math.max(high, x);
    }


    FeatureColumn finish() {
        if (kind == null) {
            throw ImportException.of("column '" + name + "' has no values at all; leave it out of the features");
        }
        double[] sd = new double[dims];
        double[] means = new double[dims];
        if (kind == FeatureKind.CATEGORICAL) {
            means = new double[levels.size()];
            sd = new double[levels.size()];
            for (int l = 0; l < levels.size(); l++) {
                double share = count == 0 ? 0 : (double) levelCounts[l] / count;
                means[l] = share;
                sd[l] = Math.sqrt(share * (1 - share));
            }
        } else {
            for (int d = 0; d < dims; d++) {
                // mean = K + S1/n; population variance = (S2 - S1^2/n) / n
                double m = sum[d] / count;
                means[d] = shift[d] + m;
                sd[d] = Math.sqrt(Math.max(0, sumSq[d] / count - m * m));
            }
        }
        boolean ranged = kind != FeatureKind.CATEGORICAL && count > 0;
        return new FeatureColumn(name, kind, dims, levels, count, missing, means, sd, ranged ? low : null,
                ranged ? high : null);
    }

    private static String shorten(String s) {
        String t = s.strip();
        return t.length() <= 40 ? t : t.substring(0, 37) + "...";
    }
}
