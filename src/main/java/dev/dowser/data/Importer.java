package dev.dowser.data;

import dev.dowser.json.Json;
import dev.dowser.records.RecordBatch;
import dev.dowser.store.Database;
import dev.dowser.store.DuplicateKeyException;
import dev.dowser.store.PoolWriter;
import dev.dowser.store.StoreException;
import java.io.InputStream;
import java.io.UncheckedIOException;

/**
 * Streams a CSV or JSON Lines file into a new pool, validating every line. All or nothing: any
 * problem stops the import with an {@link ImportException} naming the line and column, and the
 * database is left exactly as it was.
 *
 * <p>Two threads share the work: the calling thread splits the text into fields and checks and
 * encodes each record ({@link RecordEncoder}) while its characters are still in this core's
 * cache; the pool writer's thread lays out each full batch as a block and stores it. A fixed
 * number of batches circulate between the two, so memory is bounded whatever the size of the file.
 */
public final class Importer {

    /** Records read before they are encoded; few, so their text is still in cache. */
    static final int ENCODE_EVERY_ROWS = 64;
    static final int PROGRESS_EVERY_ROWS = 8_192;

    private final Database db;

    public Importer(Database db) {
        this.db = db;
    }

    public ImportResult run(InputStream input, String fileName, ImportSpec spec, ImportProgress progress) {
        long started = System.nanoTime();
        CountingInput counted = new CountingInput(input, spec.maxBytes());
        try (RowReader reader = open(counted, spec)) {
            ColumnPlan plan = ColumnPlan.resolve(reader.header(), spec);
            try (PoolWriter writer = db.newPool(spec.poolName(), reader.header().size(), plan.displayIndex(),
                    plan.idIndex() >= 0, spec.importedBy())) {
                RecordEncoder encoder = new RecordEncoder(plan, spec);
                long nextProgress = PROGRESS_EVERY_ROWS;
                boolean more = true;
                while (more) {
                    RecordBatch batch = writer.emptyBatch();
                    while (!batch.full() && (more = reader.next(batch))) {
                        if (batch.rows() - batch.encodedRows() == ENCODE_EVERY_ROWS) {
                            encode(encoder, batch);
                        }
                    }
                    encode(encoder, batch);
                    writer.send(batch);
                    if (writer.rows() >= nextProgress) {
                        progress.update(writer.rows(), counted.count());
                        nextProgress = writer.rows() + PROGRESS_EVERY_ROWS;
                    }
                }
                if (writer.rows() == 0) {
                    throw ImportException.of("the file has no records after its header");
                }
                if (encoder.classes().isEmpty() && spec.labelColumn() != null) {
                    throw ImportException.of("the label column '" + spec.labelColumn() + "' holds no labels, so the"
                            + " pool would have no classes to choose from; name the classes as well");
                }
                FeatureSchema schema = encoder.schema();
                writer.commit(encoder.classes(), Json.write(plan.roles()), Json.write(schema), "{}", fileName,
                        spec.format().word(), counted.count());
                progress.update(writer.rows(), counted.count());
                double seconds = (System.nanoTime() - started) / 1e9;
                return new ImportResult(spec.poolName(), writer.rows(), encoder.labelled(), encoder.classes(),
                        schema.encodedWidth(), counted.count(), seconds);
            }
        } catch (DuplicateKeyException e) {
            throw new ImportException(e.line(), spec.idColumn(), e.getMessage() + "; every record needs its own id");
        } catch (StoreException | IllegalArgumentException | UncheckedIOException e) {
            throw new ImportException(0, null, e.getMessage(), e);
        }
    }

    private static void encode(RecordEncoder encoder, RecordBatch batch) {
        for (int i = batch.encodedRows(); i < batch.rows(); i++) {
            encoder.accept(batch, i);
        }
    }

    static RowReader open(InputStream in, ImportSpec spec) {
        return switch (spec.format()) {
            case CSV -> new CsvRowReader(in, spec.maxFieldChars());
            case JSONL -> new JsonLinesRowReader(in, spec.maxFieldChars());
        };
    }
}
