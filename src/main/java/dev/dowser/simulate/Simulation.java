package dev.dowser.simulate;

import dev.dowser.acquire.PoolScorer;
import dev.dowser.advice.AccuracyReport;
import dev.dowser.blas.RowMajor;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.RoundService;
import dev.dowser.rounds.RoundStep;
import dev.dowser.rounds.Settling;
import dev.dowser.rounds.Strategy;
import dev.dowser.data.LabelledSet;
import dev.dowser.sampler.Predictive;
import dev.dowser.sampler.RoundDraws;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.sampler.State;
import dev.dowser.sampler.StopSignal;
import dev.dowser.stats.AccuracyEstimate;
import dev.dowser.stats.Metrics;
import dev.dowser.stats.RandomVariates;
import dev.dowser.stats.SeedTree;
import dev.dowser.stats.StabilisingPredictions;
import dev.dowser.stats.Splits;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.function.BiConsumer;
import java.util.function.IntConsumer;
import java.util.stream.LongStream;

/**
 * The whole picking loop offline, with a file's known labels acting as the labellers: round after
 * round the same {@link RoundStep} the server runs (a cold start first, then chains continued on
 * the labels so far, the pool scored, a batch picked with spot checks mixed in), and every queued
 * record's label revealed, as people at the desk would give it. After each round with a model the
 * held-out test split is scored.
 */
public final class Simulation {

    /** Branches of a seed's node in the seed tree. */
    static final int SPLIT = 0;
    static final int LOOP = 1;
    /** Branch of a round's node for its candidate sample: one the round step does not use. */
    static final int CANDIDATES = 16;

    /**
     * One point of a learning curve: the model trained on {@code labels} labels, scored on the test
     * split, and what the app would have said of it: the agreement of its stop-set predictions
     * with the round before's, whether the stopping rule said stop ({@code settled}), and the
     * accuracy the labels of its window's picks estimate ({@code estimate}; null for the last
     * round, whose picks are never labelled).
     */
    public record Point(Strategy strategy, int seed, int labels, double accuracy, double nll, double ece,
                        double seconds, double agreement, boolean settled, AccuracyEstimate estimate) {

        public Point(Strategy strategy, int seed, int labels, double accuracy, double nll, double ece, double seconds) {
            this(strategy, seed, labels, accuracy, nll, ece, seconds, Double.NaN, false, null);
        }
    }

    /**
     * What a simulation runs.
     *
     * @param strategies   the strategies compared, each on the same splits and seed sets
     * @param seeds        repeats, each with its own split and seed set
     * @param seedLabels   the size of the first batch (the cold start)
     * @param budget       labels at which a run stops
     * @param testFraction share of each class held out for testing
     * @param settings     the pool settings every round uses (its strategy is replaced by each compared)
     * @param sampler      how the posterior is sampled
     * @param seed         the root of the seed tree
     * @param candidates   records scored per round, drawn uniformly from the unlabelled ones afresh
     *                     each round ({@link #EVERY_RECORD}: all of them, as the server does); a
     *                     benchmark's plan for a large pool, not a pool setting
     */
    public record Plan(List<Strategy> strategies, int seeds, int seedLabels, int budget, double testFraction,
                       PoolSettings settings, SamplerConfig sampler, long seed, int candidates) {

        /** Every unlabelled record is scored each round. */
        public static final int EVERY_RECORD = 0;

        /** Paired seeds: ten, the fewest over which the report's intervals mean much (common practice here). */
        public static final int DEFAULT_SEEDS = 10;
        /** The first batch, picked with no labels. */
        public static final int DEFAULT_SEED_LABELS = 20;
        /** Labels at which a run stops. */
        public static final int DEFAULT_BUDGET = 300;
        /** The root of the seed tree. */
        public static final long DEFAULT_SEED = 1;

        public Plan {
            strategies = List.copyOf(strategies);
            if (strategies.isEmpty()) {
                throw new IllegalArgumentException("name at least one strategy");
            }
            if (seeds < 1 || seedLabels < 1) {
                throw new IllegalArgumentException("seeds and seed labels must be at least 1");
            }
            if (budget < seedLabels) {
                throw new IllegalArgumentException("the budget (" + budget + ") must be at least the seed labels ("
                        + seedLabels + ")");
            }
            if (candidates != EVERY_RECORD && candidates < Math.max(seedLabels, settings.batchSize())) {
                throw new IllegalArgumentException("a candidate sample of " + candidates + " records cannot fill a batch"
                        + " of " + Math.max(seedLabels, settings.batchSize()) + ": sample at least that many, or "
                        + EVERY_RECORD + " for every record");
            }
        }

        /** Every unlabelled record scored each round, as the server does. */
        public Plan(List<Strategy> strategies, int seeds, int seedLabels, int budget, double testFraction,
                    PoolSettings settings, SamplerConfig sampler, long seed) {
            this(strategies, seeds, seedLabels, budget, testFraction, settings, sampler, seed, EVERY_RECORD);
        }

        /** Rounds per strategy and seed, for a progress bar: the cold start, then one per batch and the last. */
        /** The same plan with {@code n} seeds (the first n of this one's). */
        public Plan withSeeds(int n) {
            return new Plan(strategies, n, seedLabels, budget, testFraction, settings, sampler, seed, candidates);
        }

        public int roundsEach() {
            return 2 + (budget - seedLabels + settings.batchSize() - 1) / settings.batchSize();
        }
    }

    private Simulation() {
    }

    /** Runs every strategy with every seed on the labelled set; {@code tick} is told after each round. */
    public static List<Point> run(LabelledSet all, Plan plan, IntConsumer tick) {
        return run(all, null, plan, tick);
    }

    /**
     * As above; with a fixed {@code test} set (not null), every seed works the whole of {@code pool}
     * and is scored on {@code test}, else each seed holds out its own stratified share of the pool.
     */
    public static List<Point> run(LabelledSet pool, LabelledSet test, Plan plan, IntConsumer tick) {
        return run(pool, test, plan, tick, (seedsDone, points) -> { });
    }

    /** As above; {@code afterSeed} is given the seeds done and their points after each seed, for a partial report. */
    public static List<Point> run(LabelledSet pool, LabelledSet test, Plan plan, IntConsumer tick,
                                  BiConsumer<Integer, List<Point>> afterSeed) {
        return run(pool, test, plan, DEFAULT_THREADS, tick, afterSeed);
    }

    /**
     * Curves run at once by default: one, whose rounds use every core (chains and scoring). Two
     * side by side on this 2-core machine measured 0.93, 0.97 and 1.07 of the CPU time of one at a
     * time (digits, 4 strategies; loads 10 to 27): no gain that the machine could resolve.
     */
    public static final int DEFAULT_THREADS = 1;

    /** Refuses a number of threads that cannot run a curve. */
    public static int checkThreads(int threads) {
        if (threads < 1) {
            throw new IllegalArgumentException("threads (curves run at once) must be at least 1, got " + threads);
        }
        return threads;
    }

    /**
     * As above, with up to {@code threads} curves (a strategy on a seed) running at once, each
     * round of a curve on its share of the cores (its chains and its scoring): curves side by side
     * keep the cores busy through the parts of a round that run on one thread (picking, the test
     * split's predictions) and spare the hand-overs between threads inside each round. Each curve draws only from its own seed's node of the
     * seed tree, so the points are the same, in the same order, whatever the number of threads;
     * {@code afterSeed} still comes in seed order, and {@code tick} may be called from any thread.
     */
    public static List<Point> run(LabelledSet pool, LabelledSet test, Plan plan, int threads, IntConsumer tick,
                                  BiConsumer<Integer, List<Point>> afterSeed) {
        checkThreads(threads);
        List<Point> out = new ArrayList<>();
        int classes = pool.classes().size();
        SeedTree root = SeedTree.of(plan.seed());
        int running = Math.min(threads, plan.seeds() * plan.strategies().size());
        ExecutorService workers = Executors.newFixedThreadPool(running, r -> {
            Thread t = new Thread(r, "dowser-simulate");
            t.setDaemon(true);
            return t;
        });
        // One scorer per running curve, each with its share of the cores (its chains take the same).
        int share = Math.max(1, Runtime.getRuntime().availableProcessors() / running);
        List<PoolScorer> each = new ArrayList<>();
        for (int i = 0; i < running; i++) {
            each.add(new PoolScorer(share, PoolScorer.DEFAULT_BLOCK_ROWS));
        }
        BlockingQueue<PoolScorer> scorers = new ArrayBlockingQueue<>(running, false, each);
        try {
            List<List<Future<List<Point>>>> bySeed = new ArrayList<>();
            for (int seed = 0; seed < plan.seeds(); seed++) {
                SeedTree node = root.child(seed);
                LabelledSet train = pool;
                LabelledSet held = test;
                if (test == null) {
                    Splits.Split split = Splits.stratified(pool.labels(), classes, plan.testFraction(),
                            node.child(SPLIT).rng());
                    train = pool.subset(split.train());
                    held = pool.subset(split.test());
                }
                List<Future<List<Point>>> curves = new ArrayList<>();
                for (Strategy strategy : plan.strategies()) {
                    int s = seed;
                    LabelledSet trainSet = train;
                    LabelledSet testSet = held;
                    curves.add(workers.submit(() -> {
                        PoolScorer scorer = scorers.take();
                        try {
                            return curve(strategy, s, trainSet, testSet, plan, node.child(LOOP), scorer, tick);
                        } finally {
                            scorers.add(scorer);
                        }
                    }));
                }
                bySeed.add(curves);
            }
            for (int seed = 0; seed < bySeed.size(); seed++) {
                for (Future<List<Point>> curve : bySeed.get(seed)) {
                    out.addAll(await(curve));
                }
                afterSeed.accept(seed + 1, List.copyOf(out));
            }
        } finally {
            workers.shutdownNow();
            each.forEach(PoolScorer::close);
        }
        return out;
    }

    private static List<Point> await(Future<List<Point>> curve) {
        try {
            return curve.get();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted while simulating", e);
        } catch (ExecutionException e) {
            if (e.getCause() instanceof RuntimeException re) {
                throw re;
            }
            throw new IllegalStateException("a simulated curve failed: " + e.getCause(), e.getCause());
        }
    }

    private static List<Point> curve(Strategy strategy, int seed, LabelledSet train, LabelledSet test, Plan plan,
                                     SeedTree seeds, PoolScorer scorer, IntConsumer tick) {
        int classes = train.classes().size();
        List<Point> curve = new ArrayList<>();
        long begun = System.nanoTime();
        Labeller run = new Labeller(train, plan.settings().withStrategy(strategy), plan.sampler(), seeds,
                plan.candidates());
        StabilisingPredictions rule = plan.settings().stopRule();
        List<AccuracyReport.Round> rounds = new ArrayList<>();
        List<AccuracyReport.Scored> scored = new ArrayList<>();
        while (true) {
            int labels = run.labelled();
            int batch = labels == 0 ? plan.seedLabels() : Math.min(plan.settings().batchSize(), plan.budget() - labels);
            RoundStep.Result r = run.round(Math.max(1, batch), scorer);
            tick.accept(1);
            boolean last = labels >= plan.budget() || r.queue().isEmpty();
            if (!r.cold()) {
                RoundDraws draws = r.draws();
                float[] p = Predictive.meanProbabilities(draws.layout(), draws.draws(), test.x(), test.rows());
                rounds.add(new AccuracyReport.Round(r.round(), labels, r.settling().candidates(),
                        r.settling().agreement()));
                if (!last) {
                    // Every queued record is labelled next, as the desk would: scored against the round's prediction.
                    for (RoundStep.Pick pick : r.queue()) {
                        boolean right = Metrics.argmax(pick.mean(), 0, classes) == train.labels()[(int) pick.row()];
                        scored.add(new AccuracyReport.Scored(r.round(), pick.order(), pick.probability(),
                                pick.spotCheck(), right));
                    }
                }
                AccuracyReport report = AccuracyReport.of(rounds, scored, rule);
                curve.add(new Point(strategy, seed, labels, Metrics.accuracy(p, test.labels(), classes),
                        Metrics.nll(p, test.labels(), classes), Metrics.ece(p, test.labels(), classes),
                        (System.nanoTime() - begun) / 1e9, r.settling().agreement(), rule.stable(report.agreements()),
                        last ? null : report.picked()));
            }
            if (last) {
                return curve;
            }
            run.reveal(r);
        }
    }

    /**
     * A pool whose every label is known, worked round by round as the server would: each
     * {@link #round} runs the round step on the labels revealed so far, and {@link #reveal} gives
     * the labels of everything it queued.
     */
    public static final class Labeller {

        private final LabelledSet pool;
        private final PoolSettings settings;
        private final SamplerConfig sampler;
        private final SeedTree seeds;
        private final int candidateSample;
        private final boolean[] labelled;
        private Settling.StopSet stopSet;
        private List<State<?>> chains;
        private int round;
        private int count;

        /**
         * @param pool     every record with the label a person would give it, in pool order
         * @param settings the pool's settings (their chains, draws and re-burn-in apply to the sampler)
         * @param seeds    the pool's node of the seed tree: round r draws from its child r
         */
        public Labeller(LabelledSet pool, PoolSettings settings, SamplerConfig sampler, SeedTree seeds) {
            this(pool, settings, sampler, seeds, Plan.EVERY_RECORD);
        }

        /** As above, each round scoring a uniform sample of {@code candidates} unlabelled records (see {@link Plan}). */
        public Labeller(LabelledSet pool, PoolSettings settings, SamplerConfig sampler, SeedTree seeds, int candidates) {
            // Records are named by their place in this pool, as the round step expects of every row it is given,
            // even when the pool is a split of a larger set whose rows it still carries.
            this.pool = new LabelledSet(pool.x(), pool.labels(), LongStream.range(0, pool.rows()).toArray(),
                    pool.cols(), pool.classes());
            this.settings = settings;
            this.sampler = settings.sampler(sampler);
            this.seeds = seeds;
            this.candidateSample = candidates;
            this.labelled = new boolean[pool.rows()];
            // The pool's stop set, fixed for the run, from the branch rounds never use (they count from 1).
            long[] stop = StabilisingPredictions.stopSet(pool.rows(), StabilisingPredictions.STOP_SET_RECORDS,
                    seeds.child(RoundService.STOP_SET).rng());
            int[] at = Arrays.stream(stop).mapToInt(r -> (int) r).toArray();
            this.stopSet = Settling.StopSet.fresh(new RoundStep.Rows(RowMajor.gather(pool.x(), pool.cols(), at),
                    stop, pool.cols()));
        }

        /** Labels revealed so far. */
        public int labelled() {
            return count;
        }

        /** The next round, picking {@code batch} records. */
        public RoundStep.Result round(int batch, PoolScorer scorer) {
            round++;
            int[] known = new int[count];
            int[] candidates = new int[pool.rows() - count];
            int k = 0;
            int c = 0;
            for (int i = 0; i < pool.rows(); i++) {
                if (labelled[i]) {
                    known[k++] = i;
                } else {
                    candidates[c++] = i;
                }
            }
            if (candidateSample != Plan.EVERY_RECORD && candidates.length > candidateSample) {
                candidates = sample(candidates, candidateSample, seeds.child(round).child(CANDIDATES).rng());
            }
            RoundStep.Rows cand = new RoundStep.Rows(RowMajor.gather(pool.x(), pool.cols(), candidates),
                    Arrays.stream(candidates).asLongStream().toArray(), pool.cols());
            RoundStep.Rows none = new RoundStep.Rows(new float[0], new long[0], pool.cols());
            RoundStep.Input in = new RoundStep.Input(pool.subset(known), cand, none, chains, stopSet,
                    settings.withBatchSize(batch), sampler, seeds.child(round), round);
            RoundStep.Result r = RoundStep.run(in, scorer, StopSignal.never());
            if (!r.cold()) {
                chains = r.draws().lastStates();
                stopSet = stopSet.after(r.settling());
            }
            return r;
        }

        /** {@code k} of the rows, uniformly without replacement (a partial Fisher-Yates shuffle), in pool order. */
        static int[] sample(int[] rows, int k, SplittableRandom rng) {
            int[] out = RandomVariates.sample(rows, k, rng);
            Arrays.sort(out);
            return out;
        }

        /** Every record the round queued is labelled. */
        public void reveal(RoundStep.Result r) {
            for (RoundStep.Pick p : r.queue()) {
                if (!labelled[(int) p.row()]) {
                    labelled[(int) p.row()] = true;
                    count++;
                }
            }
        }
    }
}
