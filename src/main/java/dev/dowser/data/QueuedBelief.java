package dev.dowser.data;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.json.Json;
import java.util.Map;

/**
 * What the serving model believed of a record when it was queued: each class's mean probability
 * over the posterior draws and its standard deviation across them. The one codec of the belief
 * kept with a queue entry, {@code {"mean": [...], "sd": [...]}}; queues of the first releases
 * kept only the means, as a bare array, which read back with an empty {@code sd}.
 */
public record QueuedBelief(double[] mean, double[] sd) {

    /** The JSON kept with a queue entry, from the model's float32 probabilities. */
    public static String write(float[] mean, float[] sd) {
        return Json.write(Map.of("mean", mean, "sd", sd));
    }

    /** The class the model found most probable (the first of equals). */
    public int top() {
        int top = 0;
        for (int c = 1; c < mean.length; c++) {
            if (mean[c] > mean[top]) {
                top = c;
            }
        }
        return top;
    }

    public static QueuedBelief parse(String json) {
        JsonNode n = Json.tree(json);
        return n.isArray() ? new QueuedBelief(numbers(n), new double[0])
                : new QueuedBelief(numbers(n.path("mean")), numbers(n.path("sd")));
    }

    private static double[] numbers(JsonNode array) {
        double[] out = new double[array.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = array.get(i).asDouble();
        }
        return out;
    }
}
