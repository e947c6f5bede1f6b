package dev.dowser.store;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.json.Json;
import java.util.ArrayList;
import java.util.List;

/**
 * What the model believed of a record when it was queued: the mean probability of each class over
 * the posterior draws and its standard deviation across them ({@code sd} empty when not kept). The
 * one codec of the belief kept with a queue entry, {"mean": [...], "sd": [...]}.
 */
public record Belief(List<Double> mean, List<Double> sd) {

    public Belief {
        mean = List.copyOf(mean);
        sd = List.copyOf(sd);
    }

    /** The belief of class probabilities {@code mean} and spreads {@code sd}, each over the classes in order. */
    public static Belief of(float[] mean, float[] sd) {
        return new Belief(doubles(mean), doubles(sd));
    }

    private static List<Double> doubles(float[] v) {
        List<Double> out = new ArrayList<>(v.length);
        for (float x : v) {
            out.add((double) x);
        }
        return out;
    }

    /** The document kept with a queue entry; values in single precision, as the model computes them. */
    public String toJson() {
        ObjectNode n = Json.object();
        ArrayNode m = n.putArray("mean");
        mean.forEach(v -> m.add(v.floatValue()));
        ArrayNode s = n.putArray("sd");
        sd.forEach(v -> s.add(v.floatValue()));
        return Json.write(n);
    }

    /** The mean probability of class {@code c}. */
    public double mean(int c) {
        return mean.get(c);
    }

    /** The class the model found most probable (the first of equals). */
    public int top() {
        int top = 0;
        for (int c = 1; c < mean.size(); c++) {
            if (mean.get(c) > mean.get(top)) {
                top = c;
            }
        }
        return top;
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
