package dev.dowser.advice;

import dev.dowser.stats.AccuracyEstimate;
import dev.dowser.stats.LearningCurve;
import dev.dowser.stats.StabilisingPredictions;
import dev.dowser.words.Worded;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * The "keep labelling?" card: from the accuracy estimates, the agreement of successive rounds'
 * predictions on the stop set and the learning curve, one headline in plain words (also the
 * desk's line) and a few lines of detail.
 *
 * @param state    what the card says, in one word
 * @param headline one sentence
 * @param details  supporting lines, each a sentence
 */
public record StopAdvice(State state, String headline, List<String> details) {

    /** What the card says; its word is the API's {@code state} and the page's style for the card. */
    public enum State implements Worded {
        /** No model yet. */
        START,
        /** Too little to tell. */
        EARLY,
        /** Labels are still paying. */
        PAYING,
        /** Gains are small, though predictions still shift. */
        SLOWING,
        /** Predictions have settled: the stopping rule says stop. */
        SETTLED
    }

    /** Below this projected gain per 100 labels (in points), labels are said to pay little. */
    public static final double PAYING_POINTS_PER_100 = 1.0;

    public StopAdvice {
        details = List.copyOf(details);
    }

    /**
     * What the card is built from.
     *
     * @param labels     labels the serving model learnt from
     * @param accuracy   the best estimate of the serving model's accuracy (unknown when nothing is measured)
     * @param agreements kappa between each round's predictions on the stop set and the round before's, oldest first
     * @param rule       the stopping rule for those agreements
     * @param curve      the learning curve fitted to the accuracy estimates, or null while there are too few
     */
    public record Evidence(int labels, AccuracyEstimate accuracy, List<Double> agreements,
                           StabilisingPredictions rule, LearningCurve curve) {

        public Evidence {
            agreements = List.copyOf(agreements);
        }
    }

    public static StopAdvice of(Evidence e) {
        List<String> details = new ArrayList<>();
        double recent = e.rule().recentMean(e.agreements());
        if (!e.agreements().isEmpty()) {
            double last = e.agreements().get(e.agreements().size() - 1);
            details.add(Double.isFinite(recent)
                    ? String.format(Locale.ROOT, "Agreement of successive rounds' predictions: %.3f on average over"
                            + " the last %d rounds (%.3f counts as settled).", recent, e.rule().window(),
                            e.rule().threshold())
                    : String.format(Locale.ROOT, "Agreement of the last two rounds' predictions: %s (%d rounds"
                            + " are needed to judge, %.3f on average counts as settled).", kappa(last),
                            e.rule().window(), e.rule().threshold()));
        }
        if (e.curve() != null) {
            details.add(projections(e.curve(), e.labels()));
        }
        if (e.labels() == 0 || (e.agreements().isEmpty() && !e.accuracy().known())) {
            return new StopAdvice(State.START, "No model yet: the first labels teach it. Dowser can tell whether more"
                    + " labels pay after a few rounds.", details);
        }
        if (e.rule().stable(e.agreements())) {
            return new StopAdvice(State.SETTLED, "Predictions have settled: they barely changed over the last "
                    + e.rule().window() + " rounds" + accuracyClause(e.accuracy()) + ". More labels are unlikely to"
                    + " change it much.", details);
        }
        if (e.curve() != null && e.curve().b() > 0) {
            LearningCurve.Projection gain = e.curve().gain(e.labels(), 100);
            double points = 100 * gain.accuracy();
            if (points >= PAYING_POINTS_PER_100) {
                return new StopAdvice(State.PAYING, "Labels are still paying: about +" + points(points)
                        + " points per 100 labels.", details);
            }
            return new StopAdvice(State.SLOWING, "Gains are slowing: about +" + points(points) + " points per 100 labels,"
                    + " though predictions still shift between rounds.", details);
        }
        if (e.curve() != null) {
            return new StopAdvice(State.SLOWING, "No gain shows in the last rounds' accuracy, though predictions still"
                    + " shift between rounds.", details);
        }
        // The labels the last round learnt from, not the labels given so far: a desk's count runs ahead of it.
        return new StopAdvice(State.EARLY, "Too early to tell: the last round learnt from " + e.labels() + " labels."
                + " After a few more rounds Dowser can say whether labels are still paying.", details);
    }

    /** ", accuracy 0.93 (0.90-0.95)", or nothing while accuracy is unmeasured. */
    static String accuracyClause(AccuracyEstimate a) {
        return a.known() ? "; accuracy " + proportion(a) : "";
    }

    /** 0.93 (0.90-0.95) */
    public static String proportion(AccuracyEstimate a) {
        return String.format(Locale.ROOT, "%.2f (%.2f-%.2f)", a.accuracy(), a.lower(), a.upper());
    }

    static String projections(LearningCurve curve, int labels) {
        StringBuilder s = new StringBuilder("Projected accuracy from the learning curve:");
        int[] more = {100, 500, 1000};
        for (int i = 0; i < more.length; i++) {
            LearningCurve.Projection p = curve.project(labels + more[i]);
            s.append(i == 0 ? " " : i == more.length - 1 ? " and " : ", ")
                    .append(String.format(Locale.ROOT, "%.2f", clip(p.accuracy())));
            if (Double.isFinite(p.lower())) {
                s.append(String.format(Locale.ROOT, " (%.2f-%.2f)", clip(p.lower()), clip(p.upper())));
            }
            s.append(String.format(Locale.ROOT, " after %,d more labels", more[i]));
        }
        return s.append('.').toString();
    }

    private static double clip(double v) {
        return Double.isNaN(v) ? v : Math.max(0, Math.min(1, v));
    }

    /** A gain in points: whole points from 2 up, one decimal below. */
    static String points(double p) {
        return p >= 2 ? String.format(Locale.ROOT, "%.0f", p) : String.format(Locale.ROOT, "%.1f", p);
    }

    private static String kappa(double k) {
        return Double.isNaN(k) ? "not measurable yet (one class predicted everywhere)"
                : String.format(Locale.ROOT, "%.3f", k);
    }
}
