package dev.dowser.advice;

import dev.dowser.stats.AccuracyEstimate;
import dev.dowser.stats.LearningCurve;
import dev.dowser.stats.Lure;
import dev.dowser.stats.StabilisingPredictions;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

/**
 * How good the model is, honestly, from labels scored against the predictions made before they
 * were known, and whether more labels still pay. Pure: the server builds it from the database,
 * {@code simulate} from its own rounds.
 *
 * <p>Two estimates of accuracy on the records not yet labelled, both over a window of recent
 * rounds. Spot checks were drawn uniformly, so the share right is unbiased as it stands. Every
 * other pick was drawn with a known probability when the picking was random (power sampling,
 * random), so LURE (Farquhar, Gal & Rainforth 2021) reweighs its label into an unbiased estimate
 * too; greedy picks (the b best scores) were certain, and nothing can reweigh them. A round
 * counts up to its first pick without a label: LURE needs the picks in their order.
 *
 * <p>The window: the rounds whose models learnt from at least {@link #WINDOW_SHARE} of the
 * labels the newest had, widened to {@link #WINDOW_MIN_LABELS} scored picks. Measured on digits
 * (32 and 64 draws, power sampling, 5 seeds, 245 rounds): windows of a fixed 10 or 20 rounds lag
 * the rising curve and covered the held-out accuracy in 78% and 41% of rounds; two thirds covered
 * it in 97-100%, a half in 89-98%.
 *
 * @param modelRound   the newest round whose picks have labels (the model the window ends with)
 * @param modelLabels  the labels that model learnt from
 * @param firstRound   the window's oldest round
 * @param picked       LURE over the window's picks (unknown when none were random)
 * @param checked      the window's spot checks
 * @param perRound     each round's own estimate (LURE where it can, else its spot checks), oldest first
 * @param curve        the learning curve fitted to {@code perRound}, or null while too few
 * @param agreements   each round's stop-set agreement with the round before, oldest first
 * @param advice       the keep-labelling card
 */
public record AccuracyReport(int modelRound, long modelLabels, int firstRound, AccuracyEstimate picked,
                             AccuracyEstimate checked, List<RoundEstimate> perRound, LearningCurve curve,
                             List<Double> agreements, StopAdvice advice) {

    public static final double WINDOW_SHARE = 2.0 / 3;
    public static final int WINDOW_MIN_LABELS = 30;

    public AccuracyReport {
        perRound = List.copyOf(perRound);
        agreements = List.copyOf(agreements);
    }

    /**
     * One label scored: the record a round picked, the prediction the round's model made for it,
     * and the label people gave.
     *
     * @param round       the round that picked it
     * @param order       its place among the round's picks (1 first)
     * @param probability the probability it was picked with (null where none was kept)
     * @param spotCheck   drawn uniformly rather than by score
     * @param right       the label is known (a final label) and matched the prediction; null while unknown
     */
    public record Scored(int round, int order, Double probability, boolean spotCheck, Boolean right) {
    }

    /**
     * A round with a model.
     *
     * @param round      its number
     * @param labels     the labels its model learnt from
     * @param candidates the unlabelled records it picked from
     * @param agreement  its stop-set agreement with the round before (NaN: nothing to compare)
     */
    public record Round(int round, long labels, long candidates, double agreement) {
    }

    /** One round's own estimate, a point of the learning curve. */
    public record RoundEstimate(int round, long labels, AccuracyEstimate accuracy, boolean weighted) {
    }

    /** The best estimate of accuracy: the one worth more labels. */
    public AccuracyEstimate best() {
        return picked.worth() >= checked.worth() ? picked : checked;
    }

    public static AccuracyReport of(List<Round> rounds, List<Scored> scored, StabilisingPredictions rule) {
        Map<Integer, List<Scored>> byRound = new TreeMap<>();
        for (Scored s : scored) {
            byRound.computeIfAbsent(s.round(), r -> new ArrayList<>()).add(s);
        }
        List<Double> agreements = new ArrayList<>();
        List<RoundEstimate> perRound = new ArrayList<>();
        List<Terms> terms = new ArrayList<>();
        for (Round r : rounds) {
            if (!Double.isNaN(r.agreement()) || !agreements.isEmpty()) {
                agreements.add(r.agreement());
            }
            Terms t = Terms.of(r, byRound.getOrDefault(r.round(), List.of()));
            if (t.scored() == 0) {
                continue;
            }
            terms.add(t);
            AccuracyEstimate own = t.weighted() ? t.lureEstimate() : t.checkEstimate();
            if (own.known()) {
                perRound.add(new RoundEstimate(r.round(), r.labels(), own, t.weighted()));
            }
        }
        AccuracyEstimate none = AccuracyEstimate.ofChecks(0, 0);
        // The card speaks of the newest round's model: the labels it learnt from, not those given since.
        int learnt = rounds.isEmpty() ? 0 : (int) rounds.get(rounds.size() - 1).labels();
        if (terms.isEmpty()) {
            StopAdvice card = StopAdvice.of(new StopAdvice.Evidence(learnt, none, agreements, rule, null));
            return new AccuracyReport(0, 0, 0, none, none, perRound, null, agreements, card);
        }
        // The window: newest rounds back to those that learnt from two thirds as many labels, and at least 30 scored.
        Terms newest = terms.get(terms.size() - 1);
        int from = terms.size() - 1;
        int count = newest.scored();
        while (from > 0 && (terms.get(from - 1).round.labels() >= WINDOW_SHARE * newest.round.labels()
                || count < WINDOW_MIN_LABELS)) {
            from--;
            count += terms.get(from).scored();
        }
        List<Terms> window = terms.subList(from, terms.size());
        LearningCurve curve = fit(perRound);
        AccuracyEstimate picked = Terms.pooledLure(window);
        AccuracyEstimate checked = Terms.pooledChecks(window);
        AccuracyEstimate best = picked.worth() >= checked.worth() ? picked : checked;
        StopAdvice card = StopAdvice.of(new StopAdvice.Evidence(learnt, best, agreements, rule, curve));
        return new AccuracyReport(newest.round.round(), newest.round.labels(), window.get(0).round.round(), picked,
                checked, perRound, curve, agreements, card);
    }

    private static LearningCurve fit(List<RoundEstimate> points) {
        List<RoundEstimate> usable = points.stream().filter(p -> p.labels() >= 1 && p.accuracy().worth() > 0).toList();
        double[] n = new double[usable.size()];
        double[] y = new double[usable.size()];
        double[] w = new double[usable.size()];
        for (int i = 0; i < n.length; i++) {
            n[i] = usable.get(i).labels();
            y[i] = usable.get(i).accuracy().accuracy();
            w[i] = usable.get(i).accuracy().worth();
        }
        return LearningCurve.fit(n, y, w);
    }

    /** A round's scored labels: its LURE terms over the labelled prefix of its picks, and its spot checks. */
    private record Terms(Round round, double[] right, double[] v, boolean weighted, long checksRight,
                         long checks) {

        int scored() {
            return Math.max(right.length, (int) checks);
        }

        static Terms of(Round r, List<Scored> picks) {
            List<Scored> sorted = new ArrayList<>(picks);
            sorted.sort(java.util.Comparator.comparingInt(Scored::order));
            // The prefix of picks that all have a label and a probability, and whether every one was drawn at random.
            int prefix = 0;
            boolean random = true;
            while (prefix < sorted.size() && sorted.get(prefix).order() == prefix + 1
                    && sorted.get(prefix).right() != null && sorted.get(prefix).probability() != null) {
                Scored s = sorted.get(prefix);
                // A certain pick among several records left was greedy: it cannot be reweighed.
                random &= s.probability() < 1 || r.candidates() - s.order() + 1 <= 1;
                prefix++;
            }
            double[] right = new double[random ? prefix : 0];
            double[] q = new double[right.length];
            for (int m = 0; m < right.length; m++) {
                right[m] = sorted.get(m).right() ? 1 : 0;
                q[m] = sorted.get(m).probability();
            }
            double[] v = Lure.weights(q, r.candidates());
            long checksRight = 0;
            long checks = 0;
            for (Scored s : sorted) {
                if (s.spotCheck() && s.right() != null) {
                    checks++;
                    checksRight += s.right() ? 1 : 0;
                }
            }
            return new Terms(r, right, v, random && prefix > 0, checksRight, checks);
        }

        AccuracyEstimate lureEstimate() {
            return AccuracyEstimate.weighted(right, v);
        }

        AccuracyEstimate checkEstimate() {
            return AccuracyEstimate.ofChecks(checksRight, checks);
        }

        /** LURE over several rounds: each round's terms over their common count, (1/sum M) sum_r sum_m v_m L_m. */
        static AccuracyEstimate pooledLure(List<Terms> rounds) {
            int total = rounds.stream().filter(Terms::weighted).mapToInt(t -> t.right.length).sum();
            double[] right = new double[total];
            double[] v = new double[total];
            int at = 0;
            for (Terms t : rounds) {
                if (t.weighted()) {
                    System.arraycopy(t.right, 0, right, at, t.right.length);
                    System.arraycopy(t.v, 0, v, at, t.v.length);
                    at += t.right.length;
                }
            }
            return AccuracyEstimate.weighted(right, v);
        }

        static AccuracyEstimate pooledChecks(List<Terms> rounds) {
            long right = 0;
            long all = 0;
            for (Terms t : rounds) {
                right += t.checksRight;
                all += t.checks;
            }
            return AccuracyEstimate.ofChecks(right, all);
        }
    }
}
