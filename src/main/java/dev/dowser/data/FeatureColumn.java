package dev.dowser.data;

import java.util.List;

/**
 * One source column of a pool's features with the statistics measured at import.
 *
 * @param name    the column's name in the file
 * @param kind    how it is encoded
 * @param dims    numbers per record in the raw blob when present (1 unless an embedding)
 * @param levels  the distinct values of a categorical column, in order of first appearance
 * @param count   records with a value
 * @param missing records without one
 * @param mean    per dimension: mean of the values (for a categorical column, each level's share)
 * @param sd      per dimension: population standard deviation of the values
 * @param low     the smallest value over every dimension (null for a categorical column, or a pool
 *                imported before it was kept); with {@code high}, the range a trace is drawn on
 * @param high    the largest value over every dimension
 */
public record FeatureColumn(String name, FeatureKind kind, int dims, List<String> levels, long count, long missing,
                            double[] mean, double[] sd, Double low, Double high) {

    public FeatureColumn {
        levels = List.copyOf(levels);
    }

    /** Width of this column in the model's feature vector: values, then a missing indicator if ever missing. */
    public int encodedWidth() {
        int values = kind == FeatureKind.CATEGORICAL ? levels.size() : dims;
        return values + (missing > 0 ? 1 : 0);
    }
}
