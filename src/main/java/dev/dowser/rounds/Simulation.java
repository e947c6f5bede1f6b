package dev.dowser.rounds;

import dev.dowser.acquire.ColdStart;
import dev.dowser.acquire.PoolScorer;
import dev.dowser.data.LabelledSet;
import dev.dowser.sampler.PosteriorSampler;
import dev.dowser.sampler.Predictive;
import dev.dowser.sampler.Sample;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.sampler.State;
import dev.dowser.stats.Metrics;
import dev.dowser.stats.Splits;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.function.IntConsumer;

/**
 * The whole picking loop offline, with a file's known labels acting as the labeller: seed labels
 * by k-means++, then round after round continue the chains on the labels so far (warm start, as
 * the app does), score the unlabelled training rows, pick a batch by the strategy, and reveal its
 * labels; after each round the held-out test split is scored.
 */
public final class Simulation {

    public static final int ECE_BINS = 15;

    /** One point of a learning curve. */
    public record Point(Strategy strategy, int seed, int labels, double accuracy, double nll, double ece,
                        double seconds) {
    }

    /** What a simulation runs: strategies, seeds, sizes. */
    public record Plan(List<Strategy> strategies, int seeds, int seedLabels, int batch, int budget,
                       double testFraction, SamplerConfig sampler) {

        public Plan {
            strategies = List.copyOf(strategies);
            if (strategies.isEmpty()) {
                throw new IllegalArgumentException("name at least one strategy");
            }
            if (seeds < 1 || seedLabels < 1 || batch < 1) {
                throw new IllegalArgumentException("seeds, seed labels and batch must be at least 1");
            }
            if (budget < seedLabels) {
                throw new IllegalArgumentException("the budget (" + budget + ") must be at least the seed labels ("
                        + seedLabels + ")");
            }
        }

        /** Rounds per strategy and seed, for a progress bar. */
        public int roundsEach() {
            return 1 + (budget - seedLabels + batch - 1) / batch;
        }
    }

    private Simulation() {
    }

    /** Runs every strategy with every seed on the labelled set; {@code tick} is told after each round. */
    public static List<Point> run(LabelledSet all, Plan plan, IntConsumer tick) {
        List<Point> out = new ArrayList<>();
        int classes = all.classes().size();
        try (PoolScorer scorer = PoolScorer.withAllCores()) {
            for (int seed = 0; seed < plan.seeds(); seed++) {
                Splits.Split split = Splits.stratified(all.labels(), classes, plan.testFraction(), 1000 + seed);
                LabelledSet train = all.subset(split.train());
                LabelledSet test = all.subset(split.test());
                int[] seedRows = ColdStart.kmeansPlusPlus(train.x(), train.rows(), train.cols(), plan.seedLabels(),
                        new SplittableRandom(2000 + seed));
                for (Strategy strategy : plan.strategies()) {
                    out.addAll(runOne(strategy, seed, train, test, seedRows, plan, scorer, tick));
                }
            }
        }
        return out;
    }

    private static List<Point> runOne(Strategy strategy, int seed, LabelledSet train, LabelledSet test,
                                      int[] seedRows, Plan plan, PoolScorer scorer, IntConsumer tick) {
        int classes = train.classes().size();
        boolean[] labelled = new boolean[train.rows()];
        List<Integer> order = new ArrayList<>();
        for (int r : seedRows) {
            if (!labelled[r]) {
                labelled[r] = true;
                order.add(r);
            }
        }
        SplittableRandom rng = new SplittableRandom(3000L * (seed + 1) + strategy.ordinal());
        PosteriorSampler sampler = new PosteriorSampler(plan.sampler().withSeed(plan.sampler().seed() + seed));
        List<State> chains = null;
        List<Point> curve = new ArrayList<>();
        long begun = System.nanoTime();
        for (int round = 0; ; round++) {
            LabelledSet known = train.subset(order.stream().mapToInt(Integer::intValue).toArray());
            Sample sample = sampler.sample(known.x(), known.labels(), classes, chains, new float[0], round);
            chains = sample.lastStates();
            float[] p = Predictive.meanProbabilities(sample.layout(), sample.draws(), test.x(), test.rows());
            curve.add(new Point(strategy, seed, order.size(), Metrics.accuracy(p, test.labels(), classes),
                    Metrics.nll(p, test.labels(), classes), Metrics.ece(p, test.labels(), classes, ECE_BINS),
                    (System.nanoTime() - begun) / 1e9));
            tick.accept(1);
            if (order.size() >= plan.budget()) {
                return curve;
            }
            int[] candidates = unlabelled(labelled);
            if (candidates.length == 0) {
                return curve;
            }
            float[] cx = new float[candidates.length * train.cols()];
            for (int i = 0; i < candidates.length; i++) {
                System.arraycopy(train.x(), candidates[i] * train.cols(), cx, i * train.cols(), train.cols());
            }
            PoolScorer.Result scores = scorer.score(sample.layout(), sample.draws(), cx, candidates.length);
            int b = Math.min(plan.batch(), plan.budget() - order.size());
            for (int pos : BatchPicker.pick(strategy, b, scores, cx, sample.layout(), sample.draws(), rng)) {
                int row = candidates[pos];
                labelled[row] = true;
                order.add(row);
            }
        }
    }

    private static int[] unlabelled(boolean[] labelled) {
        int n = 0;
        for (boolean l : labelled) {
            n += l ? 0 : 1;
        }
        int[] out = new int[n];
        int at = 0;
        for (int i = 0; i < labelled.length; i++) {
            if (!labelled[i]) {
                out[at++] = i;
            }
        }
        return out;
    }

    /**
     * The median over seeds of the first label count at which test accuracy reached the target;
     * -1 (never) when more than half the seeds never reach it.
     */
    public static int labelsToReach(List<Point> points, Strategy strategy, int seeds, double target) {
        List<Integer> firsts = new ArrayList<>();
        for (int seed = 0; seed < seeds; seed++) {
            int first = Integer.MAX_VALUE;
            for (Point p : points) {
                if (p.strategy() == strategy && p.seed() == seed && p.accuracy() >= target) {
                    first = Math.min(first, p.labels());
                }
            }
            firsts.add(first);
        }
        firsts.sort(null);
        int median = firsts.get((firsts.size() - 1) / 2);
        if (firsts.size() % 2 == 0) {
            int upper = firsts.get(firsts.size() / 2);
            median = median == Integer.MAX_VALUE || upper == Integer.MAX_VALUE ? Math.max(median, upper)
                    : (median + upper) / 2;
        }
        return median == Integer.MAX_VALUE ? -1 : median;
    }
}
