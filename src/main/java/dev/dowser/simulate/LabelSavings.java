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
            new Setup(BenchmarkData.FASHION_PIXELS, 20, 20, 1_000, List.of(0.8), FASHION_CANDIDATES));

    private LabelSavings() {
    }

    public static Setup setup(String dataset) {
        return SETUPS.stream().filter(s -> s.dataset().equals(dataset)).findFirst().orElseThrow(
                () -> new IllegalArgumentException("no benchmark dataset named '" + dataset + "'"));
    }

    /** One dataset's result. */
    public record Result(Setup setup, Simulation.Plan plan, List<Simulation.Point> points, double seconds) {
    }

    /**
     * Runs one dataset with {@code strategies} (random is added as the baseline) and writes its
     * report under {@code out/<dataset>}; {@code summary} gets its key=value lines.
     */
    public static Result run(Setup setup, Path datasetsDir, List<Strategy> strategies, int seeds, SamplerConfig sampler,
                             PoolSettings settings, Path out, PrintWriter summary, IntConsumer tick) throws IOException {
        BenchmarkData.Dataset data = BenchmarkData.load(setup.dataset(), datasetsDir);
        List<Strategy> all = new ArrayList<>(strategies);
        if (!all.contains(Strategy.RANDOM)) {
            all.add(Strategy.RANDOM);
        }
        Simulation.Plan plan = new Simulation.Plan(all, seeds, setup.seedLabels(), setup.budget(),
                Splits.DEFAULT_TEST_FRACTION, settings.withBatchSize(setup.batch()), sampler, Simulation.Plan.DEFAULT_SEED,
                setup.candidates());
        long begun = System.nanoTime();
        // After each seed but the last, the report so far: a long run stopped early still leaves its figures.
        List<Simulation.Point> points = Simulation.run(data.pool(), data.test(), plan, tick, (done, so) -> {
            if (done < seeds) {
                report(out, setup, so, plan.withSeeds(done), "partial: " + done + " of " + seeds + " seeds\n");
            }
        });
        double seconds = (System.nanoTime() - begun) / 1e9;
        String text = report(out, setup, points, plan, "");
        for (String line : text.split("\n")) {
            if (line.contains("=")) {
                summary.println(setup.dataset() + "_" + line);
            }
        }
        summary.printf(Locale.ROOT, "%s_seconds=%.0f%n", setup.dataset(), seconds);
        summary.flush();
        return new Result(setup, plan, points, seconds);
    }

    /** Writes a dataset's curves and summary.txt (after {@code head}); returns the summary. */
    private static String report(Path out, Setup setup, List<Simulation.Point> points, Simulation.Plan plan,
                                 String head) {
        try {
            SimulationReport.write(out.resolve(setup.dataset()), setup.dataset(), points, plan);
            StringWriter text = new StringWriter();
            SimulationReport.summary(new PrintWriter(text), points, plan, setup.targets());
            Files.writeString(out.resolve(setup.dataset()).resolve("summary.txt"), head + text);
            return text.toString();
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
            for (double target : r.setup().targets()) {
                double ratio = lc.savingsRatio(strategy, Strategy.RANDOM, target);
                String interval = Double.isNaN(ratio) ? "" : " (" + fmt(lc.savingsRatioInterval(strategy,
                        Strategy.RANDOM, target).lower()) + " to " + fmt(lc.savingsRatioInterval(strategy,
                        Strategy.RANDOM, target).upper()) + ")";
                t.append(String.format(Locale.ROOT, "| %s | %.2f | %s | %s | %s%s | %d/%d vs %d/%d | %s | %s |%n",
                        r.setup().dataset(), target, count(lc.labelsToReach(strategy, target)),
                        count(lc.labelsToReach(Strategy.RANDOM, target)), fmt(ratio), interval,
                        lc.seedsReaching(strategy, target), lc.seeds(), lc.seedsReaching(Strategy.RANDOM, target),
                        lc.seeds(), auc, won));
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
