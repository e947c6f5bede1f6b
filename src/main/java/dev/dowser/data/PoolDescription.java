package dev.dowser.data;

import dev.dowser.json.Json;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;

/**
 * A pool as the pages and the export describe it: its name, size and age, its classes with their
 * desk keys and how many final labels each has, how it uses its file's columns, and its features.
 */
public record PoolDescription(String name, long records, Instant createdAt, List<LabelClass> classes,
                              ColumnRoles roles, FeatureSchema schema) {

    /** One class of the label set: its name, its key on the desk (null past the last key), its final labels. */
    public record LabelClass(String name, String key, long labelled) {
    }

    public PoolDescription {
        classes = List.copyOf(classes);
    }

    /** The pool named {@code poolName} as it stands now. */
    public static PoolDescription of(Database db, String poolName) {
        PoolRow pool = db.pools().require(poolName);
        Map<String, Long> counts = db.pools().labelCounts(pool);
        List<String> keys = LabelKeys.keysFor(pool.classes());
        List<LabelClass> classes = new ArrayList<>(pool.classes().size());
        for (int i = 0; i < pool.classes().size(); i++) {
            String c = pool.classes().get(i);
            classes.add(new LabelClass(c, keys.get(i), counts.getOrDefault(c, 0L)));
        }
        return new PoolDescription(pool.name(), pool.recordCount(), pool.createdAt(), classes,
                ColumnRoles.parse(pool.columnRolesJson()), Json.read(pool.featureSchemaJson(), FeatureSchema.class));
    }
}
