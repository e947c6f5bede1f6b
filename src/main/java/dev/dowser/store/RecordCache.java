package dev.dowser.store;

import java.util.LinkedHashMap;
import java.util.Map;

/** A bounded cache of decoded records, least recently used out first. Records never change after import. */
final class RecordCache {

    /** Enough for the served queues of many pools; each record is its id and display values. */
    static final int DEFAULT_RECORDS = 20_000;

    private record Key(long pool, long row) {
    }

    private final Map<Key, RecordRow> map;

    RecordCache(int capacity) {
        if (capacity < 1) {
            throw new IllegalArgumentException("capacity must be at least 1, got " + capacity);
        }
        this.map = new LinkedHashMap<>(256, 0.75f, true) {
            @Override
            protected boolean removeEldestEntry(Map.Entry<Key, RecordRow> eldest) {
                return size() > capacity;
            }
        };
    }

    synchronized RecordRow get(long pool, long row) {
        return map.get(new Key(pool, row));
    }

    synchronized void put(long pool, long row, RecordRow record) {
        map.put(new Key(pool, row), record);
    }
}
