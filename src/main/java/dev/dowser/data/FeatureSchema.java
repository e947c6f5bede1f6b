package dev.dowser.data;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.util.ArrayList;
import java.util.List;

/**
 * The features of a pool: which source columns, how each is encoded, and the statistics that
 * standardise them. Turns a record's raw blob into the model's feature vector.
 *
 * <p>Raw blob layout (float32, little-endian), column after column: a numeric column is its value
 * or NaN when missing; a categorical column is its level index or NaN; an embedding column is its
 * {@code dims} values, or a single NaN when missing (never ambiguous: embedding values are finite).
 *
 * <p>Encoded vector: numeric and embedding values are standardised, z = (x - mean) / sd (sd = 0
 * leaves x - mean); categorical values are one-hot; a missing value takes the mean (0 after
 * standardising, the level shares for a categorical column) and sets the column's missing
 * indicator, which exists only for columns that were ever missing.
 */
public record FeatureSchema(List<FeatureColumn> columns) {

    public FeatureSchema {
        columns = List.copyOf(columns);
    }

    public int encodedWidth() {
        int w = 0;
        for (FeatureColumn c : columns) {
            w += c.encodedWidth();
        }
        return w;
    }

    /** Names of the encoded features, such as {@code flow}, {@code site=north}, {@code emb[3]}, {@code flow?missing}. */
    public List<String> encodedNames() {
        List<String> names = new ArrayList<>(encodedWidth());
        for (FeatureColumn c : columns) {
            switch (c.kind()) {
                case NUMERIC -> names.add(c.name());
                case CATEGORICAL -> c.levels().forEach(l -> names.add(c.name() + "=" + l));
                case EMBEDDING -> {
                    for (int d = 0; d < c.dims(); d++) {
                        names.add(c.name() + "[" + d + "]");
                    }
                }
            }
            if (c.missing() > 0) {
                names.add(c.name() + "?missing");
            }
        }
        return names;
    }

    /** Writes the standardised feature vector of one raw blob into {@code out} from {@code offset}. */
    public void encode(byte[] raw, float[] out, int offset) {
        encode(raw, 0, raw.length, out, offset);
    }

    /** As {@link #encode(byte[], float[], int)}, for a blob that is a slice of a larger array. */
    public void encode(byte[] raw, int rawOffset, int rawLength, float[] out, int offset) {
        ByteBuffer in = ByteBuffer.wrap(raw, rawOffset, rawLength).order(ByteOrder.LITTLE_ENDIAN);
        int o = offset;
        for (FeatureColumn c : columns) {
            float first = in.getFloat();
            boolean missing = Float.isNaN(first);
            switch (c.kind()) {
                case NUMERIC -> out[o++] = missing ? 0f : standard(first, c, 0);
                case CATEGORICAL -> {
                    int levels = c.levels().size();
                    for (int l = 0; l < levels; l++) {
                        out[o + l] = missing ? (float) c.mean()[l] : 0f;
                    }
                    if (!missing) {
                        out[o + (int) first] = 1f;
                    }
                    o += levels;
                }
                case EMBEDDING -> {
                    if (missing) {
                        for (int d = 0; d < c.dims(); d++) {
                            out[o++] = 0f;
                        }
                    } else {
                        out[o++] = standard(first, c, 0);
                        for (int d = 1; d < c.dims(); d++) {
                            out[o++] = standard(in.getFloat(), c, d);
                        }
                    }
                }
            }
            if (c.missing() > 0) {
                out[o++] = missing ? 1f : 0f;
            }
        }
    }

    private static float standard(float x, FeatureColumn c, int d) {
        double sd = c.sd()[d];
        double centred = x - c.mean()[d];
        return (float) (sd > 0 ? centred / sd : centred);
    }
}
