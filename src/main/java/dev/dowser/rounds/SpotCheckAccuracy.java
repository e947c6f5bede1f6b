package dev.dowser.rounds;

import dev.dowser.data.QueuedBelief;
import dev.dowser.labels.LabelRow;
import dev.dowser.stats.Metrics;
import dev.dowser.stats.Wilson;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import dev.dowser.store.QueueEntry;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * The model's accuracy as the spot checks measure it, and how it grew with the labels. Only spot
 * checks count: they were drawn uniformly from the unlabelled pool, while picked records are the
 * hard ones and would make the model look worse than it is. Each check compares the model's
 * prediction when the record was queued with the label a person then gave; the interval is
 * Wilson's (1927) at 95%, and the calibration error is Guo et al.'s (2017, eq. 3) on the same checks.
 */
public final class SpotCheckAccuracy {

    /** After {@code labels} labels in all, {@code correct} of {@code checked} spot checks agreed. */
    public record Point(long labels, long checked, long correct, double accuracy, double lower, double upper) {
    }

    /** The curve, one point per checked spot check, and the calibration error over all of them (NaN if none). */
    public record Report(List<Point> points, double ece) {

        public Point last() {
            return points.isEmpty() ? null : points.get(points.size() - 1);
        }
    }

    private SpotCheckAccuracy() {
    }

    public static Report of(Database db, PoolRow pool) {
        Map<Long, float[]> belief = new HashMap<>();
        for (QueueEntry e : db.queues().spotChecks(pool.id())) {
            float[] mean = meanOf(e.predictionJson());
            if (mean != null) {
                belief.put(e.row(), mean);
            }
        }
        List<LabelRow> labels = new ArrayList<>();
        db.labels().forEachCurrent(pool.id(), labels::add);
        labels.sort(Comparator.comparing(LabelRow::labelledAt).thenComparingLong(LabelRow::row));
        int classes = pool.classes().size();
        List<Point> points = new ArrayList<>();
        List<float[]> checkedBelief = new ArrayList<>();
        List<Integer> given = new ArrayList<>();
        long correct = 0;
        long count = 0;
        for (LabelRow l : labels) {
            count++;
            float[] p = belief.get(l.row());
            int y = pool.classes().indexOf(l.label());
            if (p == null || p.length != classes || y < 0) {
                continue;
            }
            checkedBelief.add(p);
            given.add(y);
            if (Metrics.argmax(p, 0, classes) == y) {
                correct++;
            }
            long checked = given.size();
            Wilson w = Wilson.of95(correct, checked);
            points.add(new Point(count, checked, correct, (double) correct / checked, w.lower(), w.upper()));
        }
        return new Report(points, ece(checkedBelief, given, classes));
    }

    private static double ece(List<float[]> beliefs, List<Integer> given, int classes) {
        if (beliefs.isEmpty()) {
            return Double.NaN;
        }
        float[] p = new float[beliefs.size() * classes];
        int[] y = new int[beliefs.size()];
        for (int i = 0; i < y.length; i++) {
            System.arraycopy(beliefs.get(i), 0, p, i * classes, classes);
            y[i] = given.get(i);
        }
        return Metrics.ece(p, y, classes);
    }

    /** The mean class probabilities from a queue entry's belief; null when none was kept. */
    static float[] meanOf(String json) {
        if (json == null) {
            return null;
        }
        double[] mean = QueuedBelief.parse(json).mean();
        float[] out = new float[mean.length];
        for (int i = 0; i < out.length; i++) {
            out[i] = (float) mean[i];
        }
        return out;
    }
}
