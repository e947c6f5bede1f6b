package dev.dowser.simulate;

import dev.dowser.rounds.Strategy;
import dev.dowser.stats.Bootstrap;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import java.util.TreeSet;

/**
 * A simulation's learning curves laid on one grid of label counts, with the figures that compare
 * strategies: where a mean curve first reaches a target, each seed's first count, the area under
 * the curve, and paired bootstrap intervals over seeds (every replicate resamples the same seeds
 * for every strategy). A count is only ever one that occurred on the grid; a target a curve never
 * reaches is {@link #NEVER}, never a made-up number.
 */
public final class LearningCurves {

    /** A target never reached. */
    public static final int NEVER = -1;
    public static final double LEVEL = 0.90;

    private final List<Strategy> strategies;
    private final int seeds;
    private final int[] grid;
    /** [strategy][seed][grid point] */
    private final double[][][] accuracy;
    private final double[][][] nll;
    private final Bootstrap bootstrap;

    private LearningCurves(List<Strategy> strategies, int seeds, int[] grid, double[][][] accuracy, double[][][] nll,
                           long bootstrapSeed) {
        this.strategies = List.copyOf(strategies);
        this.seeds = seeds;
        this.grid = grid;
        this.accuracy = accuracy;
        this.nll = nll;
        this.bootstrap = new Bootstrap(seeds, Bootstrap.DEFAULT_RESAMPLES, new SplittableRandom(bootstrapSeed));
    }

    /**
     * The points on the label counts that every (strategy, seed) curve has; {@code seeds} seeds
     * numbered from 0.
     */
    public static LearningCurves of(List<Simulation.Point> points, List<Strategy> strategies, int seeds) {
        TreeSet<Integer> common = null;
        for (Strategy s : strategies) {
            for (int seed = 0; seed < seeds; seed++) {
                TreeSet<Integer> counts = new TreeSet<>();
                for (Simulation.Point p : points) {
                    if (p.strategy() == s && p.seed() == seed) {
                        counts.add(p.labels());
                    }
                }
                if (common == null) {
                    common = counts;
                } else {
                    common.retainAll(counts);
                }
            }
        }
        if (common == null || common.isEmpty()) {
            throw new IllegalArgumentException("the curves share no label count");
        }
        int[] grid = common.stream().mapToInt(Integer::intValue).toArray();
        double[][][] acc = new double[strategies.size()][seeds][grid.length];
        double[][][] nll = new double[strategies.size()][seeds][grid.length];
        for (Simulation.Point p : points) {
            int s = strategies.indexOf(p.strategy());
            int g = Arrays.binarySearch(grid, p.labels());
            if (s >= 0 && g >= 0 && p.seed() < seeds) {
                acc[s][p.seed()][g] = p.accuracy();
                nll[s][p.seed()][g] = p.nll();
            }
        }
        return new LearningCurves(strategies, seeds, grid, acc, nll, 20_261_203L);
    }

    public int[] grid() {
        return grid.clone();
    }

    public List<Strategy> strategies() {
        return strategies;
    }

    public int seeds() {
        return seeds;
    }

    private int index(Strategy s) {
        int i = strategies.indexOf(s);
        if (i < 0) {
            throw new IllegalArgumentException("no curve for strategy " + s.word());
        }
        return i;
    }

    private static int[] all(int n) {
        int[] u = new int[n];
        for (int i = 0; i < n; i++) {
            u[i] = i;
        }
        return u;
    }

    /** The mean accuracy curve over the given seeds (repeats count again, as a resample does). */
    double[] meanCurve(Strategy s, int[] units) {
        double[] m = new double[grid.length];
        for (int seed : units) {
            for (int g = 0; g < grid.length; g++) {
                m[g] += accuracy[index(s)][seed][g];
            }
        }
        for (int g = 0; g < grid.length; g++) {
            m[g] /= units.length;
        }
        return m;
    }

    public double[] meanCurve(Strategy s) {
        return meanCurve(s, all(seeds));
    }

    /** The first label count at which the curve reaches the target, or NEVER. */
    private int crossing(double[] curve, double target) {
        for (int g = 0; g < grid.length; g++) {
            if (curve[g] >= target) {
                return grid[g];
            }
        }
        return NEVER;
    }

    /** Where the mean curve first reaches the target: a count on the grid, or NEVER. */
    public int labelsToReach(Strategy s, double target) {
        return crossing(meanCurve(s), target);
    }

    /** The 90% bootstrap interval of {@link #labelsToReach}; an end that never reaches is infinite. */
    public Bootstrap.Interval labelsToReachInterval(Strategy s, double target) {
        return Bootstrap.percentile(bootstrap.replicates(u -> infiniteIfNever(crossing(meanCurve(s, u), target))),
                LEVEL);
    }

    private static double infiniteIfNever(int count) {
        return count == NEVER ? Double.POSITIVE_INFINITY : count;
    }

    /** Each seed's first label count at the target (NEVER for a seed that did not reach it). */
    public int[] firsts(Strategy s, double target) {
        int[] out = new int[seeds];
        for (int seed = 0; seed < seeds; seed++) {
            out[seed] = crossing(accuracy[index(s)][seed], target);
        }
        return out;
    }

    /** How many seeds reached the target. */
    public int seedsReaching(Strategy s, double target) {
        return (int) Arrays.stream(firsts(s, target)).filter(f -> f != NEVER).count();
    }

    /**
     * The median of the seeds' first counts, the upper middle one for an even number of seeds so it
     * is a count that occurred; NEVER unless more than half the seeds reached the target.
     */
    public int medianFirst(Strategy s, double target) {
        double[] f = Arrays.stream(firsts(s, target)).mapToDouble(LearningCurves::infiniteIfNever).sorted().toArray();
        double median = f[f.length / 2];
        return Double.isInfinite(median) ? NEVER : (int) median;
    }

    /**
     * random's labels to the target over the strategy's, from the mean curves: how many times fewer
     * labels the strategy needs. Infinite when random never reaches it and the strategy does; NaN
     * when neither does.
     */
    public double savingsRatio(Strategy s, Strategy random, double target) {
        return ratio(labelsToReach(random, target), labelsToReach(s, target));
    }

    /** The paired 90% bootstrap interval of {@link #savingsRatio}. */
    public Bootstrap.Interval savingsRatioInterval(Strategy s, Strategy random, double target) {
        return Bootstrap.percentile(bootstrap.replicates(u -> ratio(crossing(meanCurve(random, u), target),
                crossing(meanCurve(s, u), target))), LEVEL);
    }

    /**
     * As {@link #savingsRatio}, with random's crossing taken from {@code baseline}: random's curves
     * on the same seeds run to a larger budget than these, so a strategy can stop early against a
     * baseline run once in full. 0 when the strategy does not reach the target within its curves.
     */
    public double savingsRatio(Strategy s, LearningCurves baseline, Strategy random, double target) {
        return ratio(baseline.labelsToReach(random, target), labelsToReach(s, target));
    }

    /** The paired 90% bootstrap interval of the ratio above: each replicate resamples the same seeds in both. */
    public Bootstrap.Interval savingsRatioInterval(Strategy s, LearningCurves baseline, Strategy random, double target) {
        if (baseline.seeds != seeds) {
            throw new IllegalArgumentException("the baseline has " + baseline.seeds + " seeds, these curves " + seeds
                    + ": pair them on the same seeds");
        }
        return Bootstrap.percentile(bootstrap.replicates(u -> ratio(baseline.crossing(baseline.meanCurve(random, u),
                target), crossing(meanCurve(s, u), target))), LEVEL);
    }

    private static double ratio(int randomCount, int strategyCount) {
        if (strategyCount == NEVER) {
            return randomCount == NEVER ? Double.NaN : 0;
        }
        return randomCount == NEVER ? Double.POSITIVE_INFINITY : (double) randomCount / strategyCount;
    }

    /**
     * The area under the curve as a mean accuracy: the trapezoid area over the grid divided by its
     * span (the accuracy itself for a one-point grid).
     */
    double area(Strategy s, int seed) {
        return area(accuracy[index(s)][seed]);
    }

    private double area(double[] curve) {
        if (grid.length == 1) {
            return curve[0];
        }
        double a = 0;
        for (int g = 1; g < grid.length; g++) {
            a += (grid[g] - grid[g - 1]) * (curve[g] + curve[g - 1]) / 2;
        }
        return a / (grid[grid.length - 1] - grid[0]);
    }

    /** The mean over seeds of the area under the curve. */
    public double meanArea(Strategy s) {
        return area(meanCurve(s));
    }

    /** The strategy's area minus random's, paired by seed, averaged: with its 90% bootstrap interval. */
    public double areaGain(Strategy s, Strategy random) {
        return meanArea(s) - meanArea(random);
    }

    public Bootstrap.Interval areaGainInterval(Strategy s, Strategy random) {
        return Bootstrap.percentile(bootstrap.replicates(u -> area(meanCurve(s, u)) - area(meanCurve(random, u))),
                LEVEL);
    }

    /** Seeds on which the strategy's area is larger than random's. */
    public int areaWins(Strategy s, Strategy random) {
        int wins = 0;
        for (int seed = 0; seed < seeds; seed++) {
            wins += area(s, seed) > area(random, seed) ? 1 : 0;
        }
        return wins;
    }

    /**
     * Accuracy or NLL at a grid count, over seeds: the median inside its quartiles (type 7), so the
     * centre always lies in the band, as on the plots (a mean can fall outside the middle half when
     * one seed lags far behind).
     */
    public record Spread(double median, double q25, double q75) {
    }

    public Spread accuracyAt(Strategy s, int labels) {
        return spread(accuracy[index(s)], labels);
    }

    public Spread nllAt(Strategy s, int labels) {
        return spread(nll[index(s)], labels);
    }

    private Spread spread(double[][] bySeed, int labels) {
        int g = Arrays.binarySearch(grid, labels);
        if (g < 0) {
            throw new IllegalArgumentException("no point at " + labels + " labels");
        }
        double[] v = new double[seeds];
        for (int seed = 0; seed < seeds; seed++) {
            v[seed] = bySeed[seed][g];
        }
        Arrays.sort(v);
        return new Spread(quantile(v, 0.5), quantile(v, 0.25), quantile(v, 0.75));
    }

    /** Type-7 quantile of sorted values. */
    static double quantile(double[] sorted, double q) {
        double h = (sorted.length - 1) * q;
        int lo = (int) Math.floor(h);
        int hi = Math.min(sorted.length - 1, lo + 1);
        return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
    }

    /** Per grid point: the median and the quartiles over seeds, for the plots. */
    public List<double[]> quartiles(Strategy s) {
        List<double[]> out = new ArrayList<>();
        for (int g = 0; g < grid.length; g++) {
            double[] v = new double[seeds];
            for (int seed = 0; seed < seeds; seed++) {
                v[seed] = accuracy[index(s)][seed][g];
            }
            Arrays.sort(v);
            out.add(new double[] {grid[g], quantile(v, 0.5), quantile(v, 0.25), quantile(v, 0.75)});
        }
        return out;
    }

    /** The grid count nearest to {@code labels}. */
    public int nearest(int labels) {
        int best = grid[0];
        for (int g : grid) {
            if (Math.abs(g - labels) < Math.abs(best - labels)) {
                best = g;
            }
        }
        return best;
    }
}
