package dev.dowser.desk;

import dev.dowser.rounds.QueuedBelief;
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

    /** Reads the belief kept with a queue entry. */
    public static Belief parse(String json) {
        QueuedBelief b = QueuedBelief.parse(json);
        return new Belief(numbers(b.mean()), numbers(b.sd()));
    }

    private static List<Double> numbers(double[] v) {
        return java.util.Arrays.stream(v).boxed().toList();
    }
}
