package dev.dowser.store;

import java.time.Instant;
import java.util.List;

/**
 * One stored pool. The JSON documents are owned by the packages that give them meaning
 * ({@code data} for column roles and the feature schema); the store only keeps them.
 */
public record PoolRow(
        long id,
        String name,
        List<String> classes,
        String columnRolesJson,
        String featureSchemaJson,
        String settingsJson,
        long recordCount,
        Instant createdAt) {

    public PoolRow {
        classes = List.copyOf(classes);
    }

    /** Refuses a label outside the pool's label set, naming the classes there are. */
    public void checkClass(String label) {
        if (!classes.contains(label)) {
            throw new IllegalArgumentException("label '" + label + "' is not one of the classes "
                    + String.join(", ", classes));
        }
    }
}
