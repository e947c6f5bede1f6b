package dev.dowser.data;

import dev.dowser.json.Json;
import java.util.List;

/**
 * How a pool uses the columns of the file it came from; stored with the pool.
 *
 * @param id          column of record ids, or null when ids are line numbers
 * @param features    columns the model sees, in feature order
 * @param display     columns a person sees, in display order
 * @param label       column of labels carried in, or null
 * @param categorical feature columns one-hot encoded
 */
public record ColumnRoles(String id, List<String> features, List<String> display, String label,
                          List<String> categorical) {

    public ColumnRoles {
        features = List.copyOf(features);
        display = List.copyOf(display);
        categorical = List.copyOf(categorical);
    }

    /** The roles as kept with a pool. */
    public static ColumnRoles parse(String json) {
        return Json.read(json, ColumnRoles.class);
    }
}
