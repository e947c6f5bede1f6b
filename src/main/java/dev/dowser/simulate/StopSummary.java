package dev.dowser.simulate;

import dev.dowser.rounds.Strategy;
import dev.dowser.stats.AccuracyEstimate;
import dev.dowser.stats.Bootstrap;
import java.io.PrintWriter;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;

/**
 * What a simulation says about stopping: for each strategy and seed, the label count at which the
 * stopping rule (stabilising predictions) said stop, beside the count from which the held-out
 * accuracy stayed within {@link #PLATEAU_POINTS} of its value at the budget; and how often the
 * accuracy estimated from the labels (LURE) held the held-out accuracy within its interval.
 */
public final class StopSummary {

    /** The test curve counts as level once it stays within this of its accuracy at the budget. */
    public static final double PLATEAU_POINTS = 0.01;
    /** Stopping costs little when test accuracy at the stop is within this of its accuracy at the budget (issue 12). */
    public static final double GAP_POINTS = 1.0;
    /** The accuracy estimate should hold the test accuracy in at least this share of rounds (issue 12). */
    public static final double COVERAGE = 0.9;

    /**
     * One seed's run of one strategy.
     *
     * @param stopAt           labels when the rule said stop, or -1 if it never did
     * @param plateauAt        labels from which test accuracy stayed within a point of its final value
     * @param accuracyAtStop   test accuracy when the rule said stop (at the budget if it never did)
     * @param accuracyAtBudget test accuracy at the budget
     * @param covered          rounds whose estimate's interval held the test accuracy
     * @param estimated        rounds with an estimate from weighted picks
     */
    public record Seed(Strategy strategy, int seed, int stopAt, int plateauAt, double accuracyAtStop,
                       double accuracyAtBudget, int covered, int estimated) {

        /** What stopping cost this seed, in points of test accuracy: at the budget less at the stop. */
        public double gapPoints() {
            return 100 * (accuracyAtBudget - accuracyAtStop);
        }
    }

    /**
     * What one strategy's seeds say of the stopping rule.
     *
     * @param seeds       seeds run
     * @param fired       seeds in which the rule said stop before the budget ran out
     * @param gapPoints   the median over seeds of each seed's gap (test accuracy at the budget less at the stop), in points
     * @param gapInterval its 90% bootstrap interval over seeds (Efron & Tibshirani 1993, the percentile interval)
     * @param covers      the share of rounds whose estimate's interval held the test accuracy, NaN with none
     */
    public record Verdict(Strategy strategy, int seeds, int fired, double gapPoints, Bootstrap.Interval gapInterval,
                          double covers) {

        /** Issue 12's test: the rule fired in every seed, cost at most a point, and the estimate was honest. */
        public boolean holds() {
            return fired == seeds && gapPoints <= GAP_POINTS && covers >= COVERAGE;
        }
    }

    /** The root of the gap's bootstrap resamples: the same seeds give the same interval. */
    public static final long BOOTSTRAP_SEED = 12;

    private StopSummary() {
    }

    /** Each strategy's seeds, from a simulation's points (in the order run). */
    public static List<Seed> seeds(List<Simulation.Point> points, List<Strategy> strategies, int seeds) {
        List<Seed> out = new ArrayList<>();
        for (Strategy s : strategies) {
            for (int seed = 0; seed < seeds; seed++) {
                int k = seed;
                List<Simulation.Point> run = points.stream().filter(p -> p.strategy() == s && p.seed() == k)
                        .sorted(Comparator.comparingInt(Simulation.Point::labels)).toList();
                if (!run.isEmpty()) {
                    out.add(of(s, seed, run));
                }
            }
        }
        return out;
    }

    static Seed of(Strategy strategy, int seed, List<Simulation.Point> run) {
        Simulation.Point end = run.get(run.size() - 1);
        Simulation.Point stop = run.stream().filter(Simulation.Point::settled).findFirst().orElse(null);
        int plateau = end.labels();
        for (int i = run.size() - 1; i >= 0 && Math.abs(run.get(i).accuracy() - end.accuracy()) <= PLATEAU_POINTS; i--) {
            plateau = run.get(i).labels();
        }
        int covered = 0;
        int estimated = 0;
        for (Simulation.Point p : run) {
            AccuracyEstimate e = p.estimate();
            if (e != null && e.known()) {
                estimated++;
                covered += p.accuracy() >= e.lower() && p.accuracy() <= e.upper() ? 1 : 0;
            }
        }
        return new Seed(strategy, seed, stop == null ? -1 : stop.labels(), plateau,
                stop == null ? end.accuracy() : stop.accuracy(), end.accuracy(), covered, estimated);
    }

    /** The verdict on one strategy's seeds; the bootstrap's resamples come from {@code seed}. */
    public static Verdict verdict(List<Seed> seeds, Strategy strategy, long seed) {
        List<Seed> mine = seeds.stream().filter(s -> s.strategy() == strategy).toList();
        if (mine.isEmpty()) {
            throw new IllegalArgumentException("no seed ran " + strategy.word());
        }
        double[] gaps = mine.stream().mapToDouble(Seed::gapPoints).toArray();
        Bootstrap b = new Bootstrap(gaps.length, Bootstrap.DEFAULT_RESAMPLES, new SplittableRandom(seed));
        double[] replicates = b.replicates(units -> {
            double[] g = new double[units.length];
            for (int i = 0; i < units.length; i++) {
                g[i] = gaps[units[i]];
            }
            return median(g);
        });
        int estimated = mine.stream().mapToInt(Seed::estimated).sum();
        int covered = mine.stream().mapToInt(Seed::covered).sum();
        return new Verdict(strategy, mine.size(), (int) mine.stream().filter(s -> s.stopAt() >= 0).count(), median(gaps),
                Bootstrap.percentile(replicates, 0.9), estimated == 0 ? Double.NaN : (double) covered / estimated);
    }

    /**
     * Per seed, where the rule stopped beside where the curve levelled off; then per strategy
     * {@code stop_at_<s>=N} (the median over seeds, {@code none} when most never stopped),
     * {@code accuracy_at_stop_<s>}, {@code accuracy_at_budget_<s>} (medians) and
     * {@code estimate_covers_<s>} (the share of rounds whose estimate's interval held the test
     * accuracy; {@code none} when no pick was drawn at random), {@code stop_fired_<s>=F/N} (seeds
     * in which the rule fired) and {@code stop_gap_<s>=G} with {@code stop_gap_<s>_interval=L..U}
     * (the median over seeds of each seed's accuracy at the budget less at the stop, in points, and
     * its 90% bootstrap interval over seeds).
     */
    public static void print(PrintWriter out, List<Seed> seeds, List<Strategy> strategies) {
        out.printf("%-10s %5s %8s %11s %17s %19s%n", "stopping", "seed", "stop_at", "plateau_at", "accuracy_at_stop",
                "accuracy_at_budget");
        for (Seed s : seeds) {
            out.printf(Locale.ROOT, "%-10s %5d %8s %11d %17.3f %19.3f%n", s.strategy().word(), s.seed(),
                    s.stopAt() < 0 ? "none" : String.valueOf(s.stopAt()), s.plateauAt(), s.accuracyAtStop(),
                    s.accuracyAtBudget());
        }
        for (Strategy st : strategies) {
            List<Seed> mine = seeds.stream().filter(s -> s.strategy() == st).toList();
            if (mine.isEmpty()) {
                continue;
            }
            double stop = median(mine.stream().mapToDouble(s -> s.stopAt() < 0 ? Double.POSITIVE_INFINITY : s.stopAt())
                    .toArray());
            out.printf(Locale.ROOT, "stop_at_%s=%s%n", st.word(), Double.isInfinite(stop) ? "none"
                    : String.valueOf(Math.round(stop)));
            out.printf(Locale.ROOT, "accuracy_at_stop_%s=%.3f%n", st.word(),
                    median(mine.stream().mapToDouble(Seed::accuracyAtStop).toArray()));
            out.printf(Locale.ROOT, "accuracy_at_budget_%s=%.3f%n", st.word(),
                    median(mine.stream().mapToDouble(Seed::accuracyAtBudget).toArray()));
            int estimated = mine.stream().mapToInt(Seed::estimated).sum();
            int covered = mine.stream().mapToInt(Seed::covered).sum();
            out.printf(Locale.ROOT, "estimate_covers_%s=%s%n", st.word(), estimated == 0 ? "none"
                    : String.format(Locale.ROOT, "%.3f", (double) covered / estimated));
            Verdict v = verdict(mine, st, BOOTSTRAP_SEED);
            out.printf(Locale.ROOT, "stop_fired_%s=%d/%d%nstop_gap_%s=%.2f%nstop_gap_%s_interval=%.2f..%.2f%n", st.word(),
                    v.fired(), v.seeds(), st.word(), v.gapPoints(), st.word(), v.gapInterval().lower(),
                    v.gapInterval().upper());
        }
        out.flush();
    }

    /** The median; with an even count, the mean of the middle two (infinite if either is). */
    static double median(double[] v) {
        double[] s = v.clone();
        java.util.Arrays.sort(s);
        int n = s.length;
        return n % 2 == 1 ? s[n / 2] : (s[n / 2 - 1] + s[n / 2]) / 2;
    }
}
