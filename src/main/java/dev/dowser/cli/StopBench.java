package dev.dowser.cli;

import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Strategy;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.simulate.BenchmarkData;
import dev.dowser.simulate.Simulation;
import dev.dowser.simulate.SimulationReport;
import dev.dowser.simulate.StopSummary;
import dev.dowser.stats.Splits;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.atomic.AtomicInteger;

/**
 * {@code dowser bench --only stopping}: issue 12's proof of the stopping rule, run as
 * {@code simulate} runs it. On digits (UCI's handwritten digits as Debian's python3-sklearn ships
 * them), the default strategy and pool settings, 10 paired seeds, 20 first labels then batches of
 * 10 up to 600: the rule (stabilising predictions) must fire in every seed, test accuracy at the
 * stop must lie within a point of its value at 600 labels (the median over seeds), and the
 * accuracy estimated from the labels (LURE) must hold the held-out accuracy in 90% of rounds.
 */
final class StopBench {

    static final String DATASET = "digits";
    static final int SEED_LABELS = 20;
    static final int BATCH = 10;
    static final int BUDGET = 600;

    private StopBench() {
    }

    static void run(PrintWriter out, Path datasets, int seeds, SamplerConfig sampler, Path dir) throws IOException {
        Strategy strategy = PoolSettings.DEFAULT_STRATEGY;
        PoolSettings settings = PoolSettings.defaults().withBatchSize(BATCH);
        Simulation.Plan plan = new Simulation.Plan(List.of(strategy), seeds, SEED_LABELS, BUDGET,
                Splits.DEFAULT_TEST_FRACTION, settings, sampler, Simulation.Plan.DEFAULT_SEED);
        BenchmarkData.Dataset data = BenchmarkData.load(DATASET, datasets);
        ProgressBar bar = new ProgressBar(System.err, "rounds of " + DATASET);
        AtomicInteger done = new AtomicInteger();
        int total = plan.roundsEach() * seeds;
        long begun = System.nanoTime();
        List<Simulation.Point> points = Simulation.run(data.pool(), data.test(), plan,
                k -> bar.show(done.addAndGet(k), total, done.get()));
        bar.finish();
        double seconds = (System.nanoTime() - begun) / 1e9;
        Path where = dir.resolve(DATASET);
        SimulationReport.write(where, DATASET, points, plan);
        List<StopSummary.Seed> each = StopSummary.seeds(points, plan.strategies(), seeds);
        StringWriter table = new StringWriter();
        StopSummary.print(new PrintWriter(table), each, plan.strategies());
        Files.writeString(where.resolve("stopping.txt"), table.toString());
        for (String line : table.toString().split("\n")) {
            out.println(line.contains("=") ? "stopping_" + line : line);
        }
        StopSummary.Verdict v = StopSummary.verdict(each, strategy, StopSummary.BOOTSTRAP_SEED);
        out.printf(Locale.ROOT, "stopping_agreement=%s%nstopping_seconds=%.0f%nstopping_curves=%s%n"
                        + "stopping_holds=%s%n", settings.stopAgreement(), seconds, where.resolve(SimulationReport.CSV),
                v.holds());
        out.flush();
    }
}
