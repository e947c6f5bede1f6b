package dev.dowser.data;

import dev.dowser.words.Worded;

/** How a source column becomes model features; its word is what the pool call shows. */
public enum FeatureKind implements Worded {
    /** One number, standardised with the pool's mean and population SD. */
    NUMERIC,
    /** One of a few text values, one-hot encoded. */
    CATEGORICAL,
    /** A JSON array of numbers of fixed length, each standardised on its own. */
    EMBEDDING
}
