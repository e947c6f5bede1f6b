package dev.dowser.desk;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.json.Json;
import java.util.ArrayList;
import java.util.List;

/**
 * What the model believed of a record when it was queued: the mean probability of each class over
 * the posterior draws and its standard deviation across them ({@code sd} empty when not kept).
 */
public record Belief(List<Double> mean, List<Double> sd) {

    public Belief {
        mean = List.copyOf(mean);
        sd = List.copyOf(sd);
    }

    /** Reads the belief kept with a queue entry; queues of the first releases kept only the means, as an array. */
    public static Belief parse(String json) {
        JsonNode n = Json.tree(json);
        return n.isArray() ? new Belief(numbers(n), List.of()) : new Belief(numbers(n.path("mean")), numbers(n.path("sd")));
    }

    private static List<Double> numbers(JsonNode array) {
        List<Double> out = new ArrayList<>(array.size());
        array.forEach(v -> out.add(v.asDouble()));
        return out;
    }
}
