package dev.dowser.simulate;

import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Strategy;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.stats.Bootstrap;
import dev.dowser.stats.Splits;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.function.IntConsumer;

/**
 * The label-savings benchmark: the simulation on every benchmark dataset with paired seeds, each
 * dataset's report in its own folder, and one table across them ({@code labels.md}) that the
 * README quotes: per dataset, labels to each target for the default strategy and for random, the
 * savings with their 90% paired bootstrap interval, and the area-under-the-curve gain with its
 * interval and the seeds it won.
 */
public final class LabelSavings {

    public static final String TABLE = "labels.md";

    /**
     * How one dataset is run: the first batch, later batches, the budget, the accuracy targets and
     * the records scored per round ({@link Simulation.Plan#candidates}).
     */
    public record Setup(String dataset, int seedLabels, int batch, int budget, List<Double> targets, int candidates) {

        /** Every unlabelled record scored each round. */
        public Setup(String dataset, int seedLabels, int batch, int budget, List<Double> targets) {
            this(dataset, seedLabels, batch, budget, targets, Simulation.Plan.EVERY_RECORD);
        }

        public Setup {
            if (budget < seedLabels) {
                throw new IllegalArgumentException(dataset + ": the budget (" + budget
                        + ") must be at least the first batch (" + seedLabels + " labels)");
            }
        }

        /** The same setup stopping at {@code labels} labels (a shorter run for a first look). */
        public Setup withBudget(int labels) {
            return new Setup(dataset, seedLabels, batch, labels, targets, candidates);
        }

        /** The same setup scoring {@code records} sampled records per round ({@link Simulation.Plan#EVERY_RECORD}: all). */
        public Setup withCandidates(int records) {
            return new Setup(dataset, seedLabels, batch, budget, targets, records);
        }
    }

    /**
     * Fashion-MNIST's plan: each round scores a uniform sample of this many of its 60,000 records
     * (and 50 principal components stand for its 784 pixels), so ten seeds at a budget of 1,000 fit
     * in an afternoon; the notes hold the paired check that the sample does not change the ranking.
     */
    public static final int FASHION_CANDIDATES = 10_000;

    /** Each dataset's setup: budgets that reach the targets, batches that suit the pool's size. */
    public static final List<Setup> SETUPS = List.of(
            new Setup("digits", 20, 10, 300, List.of(0.9, 0.95)),
            new Setup("breast_cancer", 10, 10, 150, List.of(0.95)),
            new Setup("wine", 6, 6, 60, List.of(0.9, 0.95)),
            new Setup("iris", 6, 6, 60, List.of(0.9, 0.95)),
            new Setup(BenchmarkData.PUMPS, 20, 10, 300, List.of(0.9)),
            new Setup(BenchmarkData.FASHION, 20, 20, 1_000, List.of(0.8), FASHION_CANDIDATES),
            // Not in the default run: the check that the principal components leave the strategies' order as it is.
            new Setup(BenchmarkData.FASHION_PIXELS, 20, 20, 1_000, List.of(0.8), FASHION_CANDIDATES),
            // Not in the default run: the components without whitening (the notes say why).
            new Setup(BenchmarkData.FASHION_PROJECTED, 20, 20, 1_000, List.of(0.8), FASHION_CANDIDATES));

    private LabelSavings() {
    }

    public static Setup setup(String dataset) {
        return SETUPS.stream().filter(s -> s.dataset().equals(dataset)).findFirst().orElseThrow(
                () -> new IllegalArgumentException("no benchmark dataset named '" + dataset + "'"));
    }

    /**
     * One dataset's result; {@code baseline} holds random's curves when they came from an earlier
     * run (to that run's budget, which may be larger than this one's), else nothing.
     */
    public record Result(Setup setup, Simulation.Plan plan, List<Simulation.Point> points, double seconds,
                         List<Simulation.Point> baseline) {

        public Result {
            points = List.copyOf(points);
            baseline = List.copyOf(baseline);
        }

        /** Random's curves to the earlier run's budget, when they reach further than this run's; else null. */
        LearningCurves longerBaseline() {
            int extent = baseline.stream().mapToInt(Simulation.Point::labels).max().orElse(0);
            return extent > setup.budget() ? LearningCurves.of(baseline, List.of(Strategy.RANDOM), plan.seeds()) : null;
        }
    }

    /**
     * Runs one dataset with {@code strategies} (random is added as the baseline) and writes its
     * report under {@code out/<dataset>}; {@code summary} gets its key=value lines.
     */
    public static Result run(Setup setup, Path datasetsDir, List<Strategy> strategies, int seeds, SamplerConfig sampler,
                             PoolSettings settings, Path out, PrintWriter summary, IntConsumer tick) throws IOException {
        return run(setup, datasetsDir, strategies, seeds, sampler, settings, null, out, summary, tick);
    }

    /**
     * As above; with {@code randomFrom} (not null), random is not run again: its curves come from
     * the curves.csv of an earlier run in {@code randomFrom/<dataset>}. A random curve depends only on
     * its seed (the split, the first batch, each round's uniform picks and the chains all come from
     * the seed's own node of the seed tree, whatever else runs beside it), so with the same setup,
     * settings and sampler it is the same curve; the earlier run must cover these seeds and this
     * budget, and may go further (then the savings are also given against its whole curve).
     */
    public static Result run(Setup setup, Path datasetsDir, List<Strategy> strategies, int seeds, SamplerConfig sampler,
                             PoolSettings settings, Path randomFrom, Path out, PrintWriter summary, IntConsumer tick)
            throws IOException {
        List<Strategy> all = new ArrayList<>(strategies);
        if (!all.contains(Strategy.RANDOM)) {
            all.add(Strategy.RANDOM);
        }
        Simulation.Plan plan = new Simulation.Plan(all, seeds, setup.seedLabels(), setup.budget(),
                Splits.DEFAULT_TEST_FRACTION, settings.withBatchSize(setup.batch()), sampler, Simulation.Plan.DEFAULT_SEED,
                setup.candidates());
        Simulation.Plan runs = plan;
        List<Simulation.Point> baseline = List.of();
        String from = "";
        if (randomFrom != null) {
            if (strategies.contains(Strategy.RANDOM)) {
                throw new IllegalArgumentException("random's curves come from " + randomFrom
                        + ": leave random out of the strategies");
            }
            Path csv = randomFrom.resolve(setup.dataset()).resolve(SimulationReport.CSV);
            baseline = baseline(csv, setup, seeds);
            runs = new Simulation.Plan(strategies, seeds, setup.seedLabels(), setup.budget(), plan.testFraction(),
                    plan.settings(), sampler, plan.seed(), setup.candidates());
            from = "random: not run again; its curves come from " + csv + "\n";
        }
        BenchmarkData.Dataset data = BenchmarkData.load(setup.dataset(), datasetsDir);
        List<Simulation.Point> cached = baseline.stream().filter(p -> p.labels() <= setup.budget()).toList();
        String head = from;
        List<Simulation.Point> earlier = baseline;
        long begun = System.nanoTime();
        // After each seed but the last, the report so far: a long run stopped early still leaves its figures.
        List<Simulation.Point> points = withBaseline(Simulation.run(data.pool(), data.test(), runs, tick, (done, so) -> {
            if (done < seeds) {
                report(out, new Result(setup, plan.withSeeds(done), withBaseline(so, cached, done), 0,
                        earlier.stream().filter(p -> p.seed() < done).toList()),
                        "partial: " + done + " of " + seeds + " seeds\n" + head);
            }
        }), cached, seeds);
        double seconds = (System.nanoTime() - begun) / 1e9;
        Result result = new Result(setup, plan, points, seconds, baseline);
        String text = report(out, result, head);
        if (randomFrom != null) {
            summary.println(setup.dataset() + "_random_from=" + randomFrom.resolve(setup.dataset())
                    .resolve(SimulationReport.CSV));
        }
        for (String line : text.split("\n")) {
            if (line.contains("=")) {
                summary.println(setup.dataset() + "_" + line);
            }
        }
        summary.printf(Locale.ROOT, "%s_seconds=%.0f%n", setup.dataset(), seconds);
        summary.flush();
        return result;
    }

    /** Random's points for the first {@code seeds} seeds, refused unless every count of this setup's grid is there. */
    static List<Simulation.Point> baseline(Path csv, Setup setup, int seeds) throws IOException {
        if (!Files.isRegularFile(csv)) {
            throw new IllegalArgumentException("no curves from an earlier run at " + csv);
        }
        List<Simulation.Point> random = SimulationReport.read(csv, Strategy.RANDOM).stream()
                .filter(p -> p.seed() < seeds).toList();
        for (int seed = 0; seed < seeds; seed++) {
            int s = seed;
            java.util.Set<Integer> counts = random.stream().filter(p -> p.seed() == s).map(Simulation.Point::labels)
                    .collect(java.util.stream.Collectors.toSet());
            for (int labels = setup.seedLabels(); ; labels = Math.min(labels + setup.batch(), setup.budget())) {
                if (!counts.contains(labels)) {
                    throw new IllegalArgumentException(csv + " has no random point at " + labels + " labels on seed " + s
                            + ": it must come from a run with the same first batch (" + setup.seedLabels()
                            + "), batch (" + setup.batch() + "), these seeds and a budget of at least "
                            + setup.budget());
                }
                if (labels == setup.budget()) {
                    break;
                }
            }
        }
        return random;
    }

    /** The run's points with the baseline's for its first {@code seeds} seeds, seed by seed. */
    private static List<Simulation.Point> withBaseline(List<Simulation.Point> run, List<Simulation.Point> baseline,
                                                       int seeds) {
        List<Simulation.Point> out = new ArrayList<>(run);
        baseline.stream().filter(p -> p.seed() < seeds).forEach(out::add);
        out.sort(java.util.Comparator.comparingInt(Simulation.Point::seed));
        return out;
    }

    /**
     * When random's curves reach further than this run's budget: random's labels to each target on
     * its whole curves, and each strategy's savings against them (a strategy that has not reached
     * the target within its budget saves less than the baseline's count over that budget).
     */
    private static String longerBaselineLines(Result r) {
        LearningCurves full = r.longerBaseline();
        if (full == null) {
            return "";
        }
        LearningCurves lc = LearningCurves.of(r.points(), r.plan().strategies(), r.plan().seeds());
        StringBuilder t = new StringBuilder();
        int extent = full.grid()[full.grid().length - 1];
        for (double target : r.setup().targets()) {
            String name = SimulationReport.targetName(target);
            int random = full.labelsToReach(Strategy.RANDOM, target);
            Bootstrap.Interval ri = full.labelsToReachInterval(Strategy.RANDOM, target);
            t.append(String.format(Locale.ROOT, "labels_to_%s_random_to_%d=%s%n", name, extent,
                    random == LearningCurves.NEVER ? "none" : Integer.toString(random)));
            t.append(String.format(Locale.ROOT, "labels_to_%s_random_to_%d_interval=%s..%s%n", name, extent,
                    fmt0(ri.lower()), fmt0(ri.upper())));
            for (Strategy s : r.plan().strategies()) {
                if (s == Strategy.RANDOM) {
                    continue;
                }
                String key = String.format(Locale.ROOT, "savings_%s_%s_against_random_to_%d", name, s.word(), extent);
                if (lc.labelsToReach(s, target) == LearningCurves.NEVER) {
                    t.append(key).append('=').append(below(random, r.setup().budget())).append('\n');
                    continue;
                }
                Bootstrap.Interval ci = lc.savingsRatioInterval(s, full, Strategy.RANDOM, target);
                t.append(key).append('=').append(fmt(lc.savingsRatio(s, full, Strategy.RANDOM, target))).append('\n');
                t.append(key).append("_interval=").append(fmt(ci.lower())).append("..").append(fmt(ci.upper()))
                        .append('\n');
            }
        }
        return t.toString();
    }

    /**
     * The savings of a strategy that has not reached the target within {@code budget} labels: less
     * than random's count over the budget ("none" when random never reached it either).
     */
    private static String below(int random, int budget) {
        return random == LearningCurves.NEVER ? "none" : "below " + fmt((double) random / budget)
                + " (not reached within " + budget + " labels)";
    }

    private static String fmt0(double v) {
        return Double.isInfinite(v) ? "inf" : String.format(Locale.ROOT, "%.0f", v);
    }

    /** Writes a dataset's curves and summary.txt (after {@code head}); returns the summary. */
    private static String report(Path out, Result r, String head) {
        try {
            Setup setup = r.setup();
            SimulationReport.write(out.resolve(setup.dataset()), setup.dataset(), r.points(), r.plan());
            StringWriter text = new StringWriter();
            SimulationReport.summary(new PrintWriter(text), r.points(), r.plan(), setup.targets());
            String all = text + longerBaselineLines(r);
            Files.writeString(out.resolve(setup.dataset()).resolve("summary.txt"), head + all);
            return all;
        } catch (IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
    }

    /** The table across datasets, for {@code strategy} against random. */
    public static String table(List<Result> results, Strategy strategy) {
        StringBuilder t = new StringBuilder();
        t.append("| dataset | target | labels, ").append(strategy.word()).append(" | labels, random | random / ")
                .append(strategy.word()).append(" (90% interval) | seeds reaching | AUC gain (90% interval) | seeds won |\n");
        t.append("| --- | --- | --- | --- | --- | --- | --- | --- |\n");
        for (Result r : results) {
            LearningCurves lc = LearningCurves.of(r.points(), r.plan().strategies(), r.plan().seeds());
            Bootstrap.Interval gain = lc.areaGainInterval(strategy, Strategy.RANDOM);
            String auc = String.format(Locale.ROOT, "%+.4f (%+.4f to %+.4f)", lc.areaGain(strategy, Strategy.RANDOM),
                    gain.lower(), gain.upper());
            String won = lc.areaWins(strategy, Strategy.RANDOM) + "/" + lc.seeds();
            // Random from an earlier, longer run: its labels and the savings come from its whole curves.
            LearningCurves full = r.longerBaseline();
            for (double target : r.setup().targets()) {
                String random;
                double ratio;
                Bootstrap.Interval ci;
                int randomSeeds;
                if (full == null) {
                    random = count(lc.labelsToReach(Strategy.RANDOM, target));
                    ratio = lc.savingsRatio(strategy, Strategy.RANDOM, target);
                    ci = lc.savingsRatioInterval(strategy, Strategy.RANDOM, target);
                    randomSeeds = lc.seedsReaching(Strategy.RANDOM, target);
                } else {
                    int extent = full.grid()[full.grid().length - 1];
                    random = count(full.labelsToReach(Strategy.RANDOM, target)) + " (run to " + extent + ")";
                    ratio = lc.savingsRatio(strategy, full, Strategy.RANDOM, target);
                    ci = lc.savingsRatioInterval(strategy, full, Strategy.RANDOM, target);
                    randomSeeds = full.seedsReaching(Strategy.RANDOM, target);
                }
                String interval = Double.isNaN(ratio) ? "" : " (" + fmt(ci.lower()) + " to " + fmt(ci.upper()) + ")";
                String savings = fmt(ratio) + interval;
                if (full != null && lc.labelsToReach(strategy, target) == LearningCurves.NEVER) {
                    savings = below(full.labelsToReach(Strategy.RANDOM, target), r.setup().budget());
                }
                t.append(String.format(Locale.ROOT, "| %s | %.2f | %s | %s | %s | %d/%d vs %d/%d | %s | %s |%n",
                        r.setup().dataset(), target, count(lc.labelsToReach(strategy, target)), random, savings,
                        lc.seedsReaching(strategy, target), lc.seeds(), randomSeeds, lc.seeds(), auc, won));
            }
        }
        return t.toString();
    }

    private static String count(int labels) {
        return labels == LearningCurves.NEVER ? "not reached" : Integer.toString(labels);
    }

    private static String fmt(double v) {
        if (Double.isNaN(v)) {
            return "none";
        }
        return Double.isInfinite(v) ? "inf" : String.format(Locale.ROOT, "%.2f", v);
    }
}
