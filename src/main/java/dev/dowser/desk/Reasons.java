package dev.dowser.desk;

import dev.dowser.data.QueuedBelief;
import dev.dowser.rounds.Strategy;
import dev.dowser.store.QueueEntry;
import java.util.List;
import java.util.Locale;

/**
 * Why the desk shows a record, in plain words: a spot check, a second opinion, part of the first
 * batch, or picked, with how far the model's posterior draws disagree about it. Said from what the
 * record is now, so a record carried into a later queue for its second label is not given the
 * reason it was first picked for.
 */
final class Reasons {

    /** Shares of the largest possible information (log of the class count) read as "strongly" and "clearly". */
    static final double STRONG = 0.25;
    static final double CLEAR = 0.08;

    private Reasons() {
    }

    static String why(QueueEntry e, Strategy strategy, List<String> classes, boolean secondOpinion) {
        if (secondOpinion) {
            return "Second opinion: someone has labelled this record already; label it as you see it."
                    + " The two labels show how far people agree.";
        }
        String pair = e.copies() == 2 ? " Two people label this one, neither seeing the other's label." : "";
        QueuedBelief b = e.predictionJson() == null ? null : QueuedBelief.parse(e.predictionJson());
        if (e.spotCheck()) {
            // In the first batch there is no model, and so no belief to hide.
            return "Spot check: picked at random, so that the model's accuracy is measured without the bias of"
                    + " picking" + (b == null ? "." : "; its belief stays hidden until you ask.") + pair;
        }
        if (b == null || b.mean().length != classes.size() || classes.size() < 2) {
            return "First batch: picked to cover the pool before the model has labels to learn from." + pair;
        }
        if ((strategy == Strategy.TYPICLUST_POWER || strategy == Strategy.TYPICLUST_MIX) && e.pickProbability() != null && e.pickProbability() == 1) {
            // Power sampling draws with probability below 1; a pick made outright is a typical record's.
            return "Picked as the most typical record of a part of the pool that has no label yet: while labels are"
                    + " few, covering the common cases teaches the model most. " + capitalised(view(b, classes)) + "."
                    + pair;
        }
        return picked(e.score(), b, strategy, classes) + pair;
    }

    private static String picked(double score, QueuedBelief b, Strategy strategy, List<String> classes) {
        String view = view(b, classes);
        return switch (strategy) {
            case RANDOM -> "Picked at random (the pool's strategy): " + view + ".";
            case ENTROPY -> "Picked because the model is unsure which class it is: " + view + ".";
            case MARGIN -> "Picked because the model's two likeliest classes for it are close: " + view + ".";
            default -> {
                double share = score / Math.log(classes.size());
                String how = share >= STRONG ? "disagree strongly" : share >= CLEAR ? "disagree" : "differ a little";
                yield "Picked because the model's posterior draws " + how + " about it: " + view
                        + String.format(Locale.ROOT, " (information %.2f nats). A label here teaches the model most.",
                        score);
            }
        };
    }

    /** What the draws believe of the record: the two likeliest classes, and how far single draws spread. */
    private static String view(QueuedBelief b, List<String> classes) {
        int top = b.top();
        int second = top == 0 ? 1 : 0;
        for (int c = 0; c < classes.size(); c++) {
            if (c != top && b.mean()[c] > b.mean()[second]) {
                second = c;
            }
        }
        String view = "on average its draws give " + classes.get(top) + " " + percent(b.mean()[top]) + " and "
                + classes.get(second) + " " + percent(b.mean()[second]);
        if (b.sd().length == b.mean().length) {
            view += "; single draws put " + classes.get(top) + " about " + Math.round(100 * b.sd()[top])
                    + " points either side of that";
        }
        return view;
    }

    private static String capitalised(String s) {
        return Character.toUpperCase(s.charAt(0)) + s.substring(1);
    }

    private static String percent(double p) {
        return Math.round(100 * p) + "%";
    }
}
