package dev.dowser.store;

import dev.dowser.labels.LabelRow;
import dev.dowser.labels.Resolution;
import dev.dowser.records.KeyIndex;
import dev.dowser.records.RecordBlock;
import java.io.IOException;
import java.io.InputStream;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.ConcurrentHashMap;

/**
 * Reads records: pages for people, feature bytes for the model, labelled records for export,
 * and a record's place in its pool from its id.
 */
public final class RecordStore {

    public static final int MAX_PAGE = 1_000;

    /** Receives one record's raw features: {@code length} bytes of {@code bytes} from {@code offset}. */
    @FunctionalInterface
    public interface FeatureSink {
        void accept(long row, byte[] bytes, int offset, int length);
    }

    private final Sql sql;
    private final LabelStore labels;
    /** Pools never change after import, so an id index, once built, stays right. */
    private final Map<Long, KeyIndex> keyIndex = new ConcurrentHashMap<>();

    /**
     * Records handed out one at a time (the served queues'), without their labels. Fetching one
     * record otherwise reads its whole block, 1-2 MB; rounds warm this before publishing a queue.
     */
    private final RecordCache cache = new RecordCache(RecordCache.DEFAULT_RECORDS);

    RecordStore(Sql sql, LabelStore labels) {
        this.sql = sql;
        this.labels = labels;
    }

    public void forEachFeatures(long poolId, FeatureSink sink) {
        forEachBlock(poolId, 0, Long.MAX_VALUE, Section.ALL, (first, block) ->
                block.features((i, bytes, off, len) -> sink.accept(first + i, bytes, off, len)));
    }

    /** Records {@code offset} to {@code offset + limit - 1} in pool order, with their current labels. */
    public List<RecordRow> page(long poolId, long offset, int limit) {
        if (offset < 0 || limit < 1 || limit > MAX_PAGE) {
            throw new IllegalArgumentException("offset must be 0 or more and limit between 1 and " + MAX_PAGE);
        }
        long end = offset + limit;
        if (limit == 1) {
            // One record (the desk's): through the cache, so the label that follows finds it there.
            RecordRow one = decode(poolId, new long[] {offset}).get(offset);
            if (one == null) {
                return List.of();
            }
            LabelRow[] label = new LabelRow[1];
            labels.forEachCurrent(poolId, offset, end, l -> label[0] = l);
            return List.of(one.withLabel(label[0]));
        }
        Map<Long, LabelRow> current = new HashMap<>();
        labels.forEachCurrent(poolId, offset, end, l -> current.put(l.row(), l));
        List<RecordRow> out = new ArrayList<>(limit);
        forEachBlock(poolId, offset, end, Section.HEAD, (first, block) -> {
            int from = (int) Math.max(0, offset - first);
            int to = (int) Math.min(block.size(), end - first);
            String[] keys = block.keys();
            long[] lines = block.lines();
            String[][] display = block.display(from, to);
            for (int i = from; i < to; i++) {
                long row = first + i;
                out.add(new RecordRow(row, keys[i], lines[i], Arrays.asList(display[i - from]), null, null, null,
                        null).withLabel(current.get(row)));
            }
        });
        return out;
    }

    /**
     * Reads the given records into the cache, each block once, so that fetching them one by one is
     * quick; records already cached are not read again.
     */
    public void warm(long poolId, long[] rows) {
        decode(poolId, rows);
    }

    /**
     * The records at {@code rows}, in that order, with their final labels: each block is read once
     * (records cached are not read again) and the labels in one query, for lists that show many
     * records, such as the served queue and the review page.
     */
    public List<RecordRow> rows(long poolId, long[] rows) {
        if (rows.length == 0) {
            return List.of();
        }
        Map<Long, RecordRow> found = decode(poolId, rows);
        long from = Arrays.stream(rows).min().orElseThrow();
        long to = Arrays.stream(rows).max().orElseThrow() + 1;
        Map<Long, LabelRow> current = new HashMap<>();
        labels.forEachCurrent(poolId, from, to, l -> {
            if (found.containsKey(l.row())) {
                current.put(l.row(), l);
            }
        });
        List<RecordRow> out = new ArrayList<>(rows.length);
        for (long row : rows) {
            RecordRow r = found.get(row);
            if (r == null) {
                throw new NotFoundException("pool " + poolId + " has no record at row " + row);
            }
            out.add(r.withLabel(current.get(row)));
        }
        return out;
    }

    /** Decodes the records at {@code rows} (without labels), from the cache or their blocks, and caches them. */
    private Map<Long, RecordRow> decode(long poolId, long[] rows) {
        Map<Long, RecordRow> found = new HashMap<>();
        for (long r : rows) {
            RecordRow cached = cache.get(poolId, r);
            if (cached != null) {
                found.put(r, cached);
            }
        }
        long[] sorted = Arrays.stream(rows).filter(r -> !found.containsKey(r)).sorted().distinct().toArray();
        int i = 0;
        while (i < sorted.length) {
            int[] next = {i};
            forEachBlock(poolId, sorted[i], sorted[i] + 1, Section.HEAD, (first, block) -> {
                int from = next[0];
                int to = from;
                while (to < sorted.length && sorted[to] < first + block.size()) {
                    to++;
                }
                int[] wanted = new int[to - from];
                for (int j = from; j < to; j++) {
                    wanted[j - from] = (int) (sorted[j] - first);
                }
                String[] keys = block.keys();
                long[] lines = block.lines();
                String[][] display = block.display(wanted);
                for (int j = from; j < to; j++) {
                    int k = wanted[j - from];
                    RecordRow r = new RecordRow(sorted[j], keys[k], lines[k], Arrays.asList(display[j - from]), null,
                            null, null, null);
                    cache.put(poolId, sorted[j], r);
                    found.put(sorted[j], r);
                }
                next[0] = to;
            });
            i = Math.max(i + 1, next[0]);
        }
        return found;
    }

    public Optional<RecordRow> find(long poolId, String key) {
        return rowOf(poolId, key).map(row -> page(poolId, row, 1).get(0));
    }

    /**
     * Builds the pool's id index now (reading every block's ids), so that the first label after a
     * start does not wait for it while people are at the desk.
     */
    public void warmKeys(long poolId) {
        index(poolId);
    }

    /** The place in the pool of the record with id {@code key}, if there is one. */
    public Optional<Long> rowOf(long poolId, String key) {
        long row = index(poolId).find(key, r -> keyOf(poolId, r));
        return row < 0 ? Optional.empty() : Optional.of(row);
    }

    /** The place of record {@code key} in {@code pool}; not found when the pool has no such record. */
    public long requireRow(PoolRow pool, String key) {
        return rowOf(pool.id(), key).orElseThrow(() ->
                new NotFoundException("no record '" + key + "' in pool '" + pool.name() + "'"));
    }

    /** The id of the record at {@code row}: from the cache, else from its block's keys alone. */
    private String keyOf(long poolId, long row) {
        RecordRow cached = cache.get(poolId, row);
        if (cached != null) {
            return cached.key();
        }
        String[] key = {null};
        forEachBlock(poolId, row, row + 1, Section.KEYS, (first, block) -> key[0] = block.key((int) (row - first)));
        return key[0];
    }

    private KeyIndex index(long poolId) {
        return keyIndex.computeIfAbsent(poolId, id -> {
            KeyIndex.Builder b = new KeyIndex.Builder();
            forEachBlock(id, 0, Long.MAX_VALUE, Section.KEYS, (first, block) -> {
                String[] keys = block.keys();
                for (int i = 0; i < keys.length; i++) {
                    b.add(keys[i], first + i);
                }
            });
            return b.build();
        });
    }

    /** A labelled record with where its labels stand. */
    @FunctionalInterface
    public interface LabelledSink {
        void accept(RecordRow record, Resolution resolution);
    }

    /**
     * Every record anyone has labelled, resolved or not, in pool order, streamed with bounded
     * memory; the record carries its final label when it has one.
     */
    public void forEachLabelled(long poolId, LabelledSink sink) {
        labels.withResolutionCursor(poolId, cursor -> forEachBlock(poolId, 0, Long.MAX_VALUE, Section.HEAD, (first, block) -> {
            long end = first + block.size();
            String[] keys = null;
            long[] lines = null;
            String[][] display = null;
            for (Resolution l = cursor.peek(); l != null && l.row() < end; l = cursor.peek()) {
                cursor.next();
                if (keys == null) {
                    // The display section is read from its start; decode it once per block, not once per record.
                    keys = block.keys();
                    lines = block.lines();
                    display = block.display(0, block.size());
                }
                int i = (int) (l.row() - first);
                sink.accept(new RecordRow(l.row(), keys[i], lines[i], Arrays.asList(display[i]), null, null, null, null)
                        .withLabel(l.finalLabel()), l);
            }
        }));
    }

    @FunctionalInterface
    private interface BlockVisitor {
        void visit(long firstRow, RecordBlock block);
    }

    /** How much of a block to read: its ids only, everything a page shows, or all of it with the features. */
    private enum Section { KEYS, HEAD, ALL }

    /** Visits the blocks holding any row in [fromRow, toRow), in pool order, read as far as {@code section}. */
    private void forEachBlock(long poolId, long fromRow, long toRow, Section section, BlockVisitor visitor) {
        // Blocks are 1-2 MB each: a few at a time from the database, and only as far into each as needed.
        sql.scan("read the records of pool " + poolId, "SELECT first_row, payload FROM record_blocks"
                + " WHERE pool_id = ? AND first_row < ? AND first_row + row_count > ? ORDER BY block_no", 4, rs -> {
                    while (rs.next()) {
                        RecordBlock block;
                        if (section == Section.ALL) {
                            block = new RecordBlock(rs.getBytes(2));
                        } else {
                            try (InputStream head = rs.getBinaryStream(2)) {
                                block = section == Section.KEYS ? RecordBlock.readKeys(head) : RecordBlock.readHead(head);
                            } catch (IOException e) {
                                throw new StoreException("cannot read the records of pool " + poolId + ": "
                                        + e.getMessage(), e);
                            }
                        }
                        visitor.visit(rs.getLong(1), block);
                    }
                    return null;
                }, poolId, toRow, fromRow);
    }
}
