package dev.dowser.data;

/** How a source column becomes model features. */
public enum FeatureKind {
    /** One number, standardised with the pool's mean and population SD. */
    NUMERIC,
    /** One of a few text values, one-hot encoded. */
    CATEGORICAL,
    /** A JSON array of numbers of fixed length, each standardised on its own. */
    EMBEDDING
}
