package dev.dowser.data;

import dev.dowser.records.RecordBatch;

import java.util.List;

/**
 * Reads a file one record at a time into a {@link RecordBatch}, fields aligned with the header.
 * Implementations throw {@link ImportException} for anything malformed.
 */
interface RowReader extends AutoCloseable {

    List<String> header();

    /** Appends the next record to {@code batch}; false at the end of the file. */
    boolean next(RecordBatch batch);

    @Override
    void close();
}
