package dev.dowser.store;

import dev.dowser.json.Json;
import dev.dowser.records.KeyCheck;
import dev.dowser.records.RecordBatch;
import dev.dowser.records.RecordBlock;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.SQLException;
import java.sql.Timestamp;
import java.time.Clock;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.TimeUnit;
import java.util.regex.Pattern;
import javax.sql.DataSource;

/**
 * Writes a new pool and all its records in one transaction: either {@link #commit} makes the
 * whole pool visible at once, or {@link #close} without it leaves the database exactly as it was.
 *
 * <p>The caller fills {@link RecordBatch}es and {@link #send}s them; a writer thread lays each out
 * as one {@link RecordBlock} and inserts it while the caller goes on reading, so parsing and
 * storing overlap. Only {@value #BATCHES} batches ever exist, so memory stays bounded.
 */
public final class PoolWriter implements AutoCloseable {

    public static final Pattern POOL_NAME = Pattern.compile("[A-Za-z0-9][A-Za-z0-9._-]{0,99}");
    static final int BLOCK_MAX_ROWS = 4_096;
    static final int BATCHES = 6;
    /**
     * Most fields a batch holds: a wide file gets fewer rows a batch, so that its offsets (two ints a
     * field) stay about 8 MiB a batch whatever the column count. At 64 columns a batch is still
     * {@value #BLOCK_MAX_ROWS} rows; at 20,000 it is 52 (it was 4,096, 650 MiB a batch).
     */
    static final int BATCH_MAX_FIELDS = 1 << 20;
    static final String UNIQUE_VIOLATION = "23505";

    /** A filled batch on its way to the writer thread, with its place in the pool. */
    private record Job(RecordBatch batch, int blockNo, long firstRow) {
    }

    private static final Job END = new Job(null, -1, -1);

    private final Connection connection;
    private final Clock clock;
    private final long poolId;
    private final String importedBy;
    private final RecordBlock.Builder block;
    private final KeyCheck keyCheck;
    private final BlockingQueue<Job> queue = new ArrayBlockingQueue<>(BATCHES + 1);
    private final BlockingQueue<RecordBatch> free = new ArrayBlockingQueue<>(BATCHES);
    private final Thread writer;
    private volatile Throwable writerFailure;
    private volatile boolean aborting;
    private int blockNo;
    private long rows;
    private boolean committed;
    private boolean ended;

    private PoolWriter(Connection connection, Clock clock, long poolId, int cols, int[] displayIndex,
                       boolean checkKeys, String importedBy) {
        this.connection = connection;
        this.clock = clock;
        this.poolId = poolId;
        this.importedBy = importedBy;
        this.block = new RecordBlock.Builder(displayIndex.length);
        this.keyCheck = checkKeys ? new KeyCheck() : null;
        int rowsPerBatch = Math.max(1, Math.min(BLOCK_MAX_ROWS, BATCH_MAX_FIELDS / Math.max(1, cols)));
        for (int i = 0; i < BATCHES; i++) {
            free.add(RecordBatch.forWriting(cols, displayIndex, rowsPerBatch));
        }
        this.writer = new Thread(this::writeBlocks, "dowser-pool-writer");
        this.writer.setDaemon(true);
        this.writer.start();
    }

    /**
     * Starts a pool whose batches have {@code cols} fields a record, of which those at
     * {@code displayIndex} are shown to people. {@code checkKeys} is false when ids are unique by
     * construction (line numbers); {@code importedBy} is who carried-in labels are attributed to.
     */
    static PoolWriter begin(DataSource ds, Clock clock, String name, int cols, int[] displayIndex, boolean checkKeys,
                            String importedBy) {
        checkName(name);
        Connection c = null;
        try {
            c = ds.getConnection();
            c.setAutoCommit(false);
            if (exists(c, name)) {
                throw nameTaken(name);
            }
            long id = Sql.insert(c, "INSERT INTO pools (name, label_set, column_roles, feature_schema, settings,"
                    + " record_count, created_at) VALUES (?, '[]', '{}', '{}', '{}', 0, ?)", "id", name, clock.instant());
            return new PoolWriter(c, clock, id, cols, displayIndex, checkKeys, importedBy);
        } catch (SQLException e) {
            closeQuietly(c);
            if (UNIQUE_VIOLATION.equals(e.getSQLState())) {
                throw nameTaken(name);
            }
            throw new StoreException("cannot start writing pool '" + name + "': " + e.getMessage(), e);
        } catch (RuntimeException e) {
            closeQuietly(c);
            throw e;
        }
    }

    private static boolean exists(Connection c, String name) throws SQLException {
        return Sql.first(c, "SELECT 1 FROM pools WHERE name = ?", rs -> 1, name).isPresent();
    }

    private static ConflictException nameTaken(String name) {
        return new ConflictException("a pool named '" + name + "' already exists; choose another pool name");
    }

    public static void checkName(String name) {
        if (name == null || !POOL_NAME.matcher(name).matches()) {
            throw new IllegalArgumentException("pool name '" + name + "' is not allowed: use 1 to 100 letters,"
                    + " digits, '.', '_' or '-', starting with a letter or digit");
        }
    }

    /** A cleared batch to fill; blocks until the writer has one back. */
    public RecordBatch emptyBatch() {
        try {
            RecordBatch b;
            while ((b = free.poll(100, TimeUnit.MILLISECONDS)) == null) {
                failIfWriterFailed();
            }
            return b;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new StoreException("interrupted while writing the pool", e);
        }
    }

    /**
     * Hands a filled batch, every record of it encoded, to the writer thread; the caller must not
     * touch it afterwards.
     */
    public void send(RecordBatch batch) {
        failIfWriterFailed();
        if (batch.encodedRows() != batch.rows()) {
            throw new IllegalStateException(batch.rows() - batch.encodedRows() + " records of the batch are not encoded");
        }
        if (batch.rows() == 0) {
            batch.clear();
            free.add(batch);
            return;
        }
        if (keyCheck != null) {
            for (int i = 0; i < batch.rows(); i++) {
                keyCheck.add(batch.key(i));
            }
        }
        Job job = new Job(batch, blockNo++, rows);
        // Counted before the hand-over: once queued, the batch belongs to the writer thread.
        rows += batch.rows();
        enqueue(job);
    }

    /** Records sent so far. */
    public long rows() {
        return rows;
    }

    private void enqueue(Job job) {
        try {
            while (!queue.offer(job, 100, TimeUnit.MILLISECONDS)) {
                failIfWriterFailed();
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new StoreException("interrupted while writing the pool", e);
        }
    }

    /**
     * The writer thread's loop: two statements prepared once for the whole import (not through
     * {@link Sql}), a block's payload streamed into the first from its reused buffer.
     */
    private void writeBlocks() {
        try (PreparedStatement insert = connection.prepareStatement("INSERT INTO record_blocks"
                + " (pool_id, block_no, first_row, row_count, payload) VALUES (?, ?, ?, ?, ?)");
             PreparedStatement label = connection.prepareStatement("INSERT INTO labels"
                     + " (pool_id, row_no, label, labelled_by, labelled_at, note) VALUES (?, ?, ?, ?, ?, ?)")) {
            Timestamp now = Timestamp.from(clock.instant());
            while (true) {
                Job job = queue.take();
                if (job == END) {
                    return;
                }
                RecordBatch batch = job.batch();
                if (!aborting) {
                    block.clear();
                    block.addAll(batch);
                    insert.setLong(1, poolId);
                    insert.setInt(2, job.blockNo());
                    insert.setLong(3, job.firstRow());
                    insert.setInt(4, batch.rows());
                    RecordBlock.Sealed payload = block.sealInPlace();
                    insert.setBinaryStream(5, payload.stream(), payload.length());
                    insert.executeUpdate();
                    boolean anyLabel = false;
                    for (int i = 0; i < batch.rows(); i++) {
                        if (batch.label(i) != null) {
                            label.setLong(1, poolId);
                            label.setLong(2, job.firstRow() + i);
                            label.setString(3, batch.label(i));
                            label.setString(4, importedBy);
                            label.setTimestamp(5, now);
                            label.setString(6, "carried in by the import");
                            label.addBatch();
                            anyLabel = true;
                        }
                    }
                    if (anyLabel) {
                        label.executeBatch();
                    }
                }
                batch.clear();
                free.put(batch);
            }
        } catch (InterruptedException e) {
            writerFailure = e;
            Thread.currentThread().interrupt();
        } catch (SQLException | RuntimeException e) {
            writerFailure = e;
            queue.clear();
        }
    }

    private void failIfWriterFailed() {
        Throwable t = writerFailure;
        if (t != null) {
            throw new StoreException("cannot store records: " + t.getMessage(), t);
        }
    }

    /**
     * Stops the writer thread after the blocks already queued, or at once when aborting. The
     * writer is never interrupted: an interrupt during a file write would close H2's file.
     */
    private void endWriter(boolean abort) {
        if (ended) {
            return;
        }
        ended = true;
        if (abort) {
            aborting = true;
            queue.clear();
        }
        boolean interrupted = false;
        while (writer.isAlive()) {
            if (writerFailure == null && queue.offer(END)) {
                break;
            }
            try {
                writer.join(50);
            } catch (InterruptedException e) {
                interrupted = true;
            }
        }
        while (true) {
            try {
                writer.join();
                break;
            } catch (InterruptedException e) {
                interrupted = true;
            }
        }
        if (interrupted) {
            Thread.currentThread().interrupt();
        }
    }

    /** Makes the pool visible with its metadata and records. */
    public void commit(List<String> classes, String columnRolesJson, String featureSchemaJson, String settingsJson,
                       String fileName, String fileFormat, long byteCount) {
        endWriter(false);
        failIfWriterFailed();
        try {
            if (keyCheck != null) {
                Set<Long> repeated = keyCheck.repeated();
                if (!repeated.isEmpty()) {
                    throw firstDuplicate(repeated);
                }
            }
            Sql.update(connection, "UPDATE pools SET label_set = ?, column_roles = ?, feature_schema = ?, settings = ?,"
                    + " record_count = ? WHERE id = ?", Json.write(classes), columnRolesJson, featureSchemaJson,
                    settingsJson, rows, poolId);
            Sql.update(connection, "INSERT INTO imports (pool_id, file_name, file_format, row_count, byte_count,"
                    + " finished_at) VALUES (?, ?, ?, ?, ?, ?)", poolId,
                    fileName.length() <= 500 ? fileName : fileName.substring(0, 500), fileFormat, rows, byteCount,
                    clock.instant());
            connection.commit();
            committed = true;
        } catch (SQLException e) {
            throw new StoreException("cannot finish writing the pool: " + e.getMessage(), e);
        }
    }

    /** Confirms repeated hashes against the ids written so far and names the earliest repeat. */
    private DuplicateKeyException firstDuplicate(Set<Long> hashes) throws SQLException {
        Map<String, Long> firstLine = new HashMap<>();
        DuplicateKeyException earliest = Sql.scan(connection, "SELECT payload FROM record_blocks WHERE pool_id = ?"
                + " ORDER BY block_no", 2, rs -> {
                    while (rs.next()) {
                        RecordBlock b = new RecordBlock(rs.getBytes(1));
                        String[] keys = b.keys();
                        long[] lines = b.lines();
                        for (int i = 0; i < keys.length; i++) {
                            if (hashes.contains(KeyCheck.hash(keys[i]))) {
                                Long first = firstLine.putIfAbsent(keys[i], lines[i]);
                                if (first != null) {
                                    return new DuplicateKeyException(keys[i], first, lines[i]);
                                }
                            }
                        }
                    }
                    return null;
                }, poolId);
        if (earliest == null) {
            throw new StoreException("id check found a repeated hash but no repeated id; please report this");
        }
        return earliest;
    }

    /** Rolls back unless {@link #commit} succeeded, then releases the connection. */
    @Override
    public void close() {
        try {
            endWriter(!committed);
            if (!committed) {
                connection.rollback();
            }
        } catch (SQLException e) {
            throw new StoreException("cannot roll back the unfinished pool: " + e.getMessage(), e);
        } finally {
            if (keyCheck != null) {
                keyCheck.close();
            }
            closeQuietly(connection);
        }
    }

    private static void closeQuietly(Connection c) {
        if (c == null) {
            return;
        }
        try {
            c.setAutoCommit(true);
            c.close();
        } catch (SQLException ignored) {
            // The pool discards a connection it cannot reset; nothing more to do here.
        }
    }
}
