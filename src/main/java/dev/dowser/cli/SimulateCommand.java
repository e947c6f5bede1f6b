package dev.dowser.cli;

import dev.dowser.acquire.ColdStart;
import dev.dowser.data.LabelledSet;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Strategy;
import dev.dowser.simulate.Simulation;
import dev.dowser.simulate.SimulationReport;
import dev.dowser.stats.Splits;
import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import java.util.concurrent.atomic.AtomicInteger;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

@Command(name = "simulate", mixinStandardHelpOptions = true,
        description = {"Shows, on your own labelled data, how many labels picking saves over labelling at random.",
            "Runs the server's own round step offline with the file's labels acting as the labellers: a cold"
                + " start, then round after round the chains continued, the pool scored, a batch picked with spot"
                + " checks mixed in. Every strategy sees the same splits and first batches (paired seeds). Writes"
                + " DIR/curves.csv, curves.svg and curves.png, and prints a table and key=value lines: labels to"
                + " each target from the mean curve with a 90%% bootstrap interval over seeds, the seeds that"
                + " reached it, the median of the seeds' first counts, random's labels over each strategy's,"
                + " the area under the curve, accuracy and NLL at fixed label counts; then, per seed, where the stopping rule"
                + " fired beside where the test curve levelled off, and stop_at_<strategy>=N,"
                + " accuracy_at_stop_<strategy>=A, accuracy_at_budget_<strategy>=B and"
                + " estimate_covers_<strategy>=F lines."})
final class SimulateCommand implements Callable<Integer> {

    @Spec
    CommandSpec command;

    @Mixin
    LabelledFile input;

    @Mixin
    SamplerOptions sampler;

    @Option(names = "--strategies", split = ",", defaultValue = "default,random", paramLabel = "S",
            description = "Strategies: bald, power, typiclust-power, typiclust-mix, batchbald, entropy, margin, random, or default (what a new pool"
                    + " uses) (default: ${DEFAULT-VALUE}).")
    List<String> strategies;

    @Option(names = "--seed-labels", defaultValue = "" + Simulation.Plan.DEFAULT_SEED_LABELS, paramLabel = "N",
            description = "Size of the first batch, picked with no labels (default: ${DEFAULT-VALUE}).")
    int seedLabels;

    @Option(names = "--cold-start", defaultValue = PoolSettings.DEFAULT_COLD_START_WORD, paramLabel = "kmeans++|typiclust",
            description = "How the first batch is spread over the pool (default: ${DEFAULT-VALUE}).")
    String coldStart;

    @Option(names = "--batch", defaultValue = "" + PoolSettings.DEFAULT_BATCH_SIZE, paramLabel = "B",
            description = "Labels per round (default: ${DEFAULT-VALUE}).")
    int batch;

    @Option(names = "--spot-check-share", defaultValue = "" + PoolSettings.DEFAULT_SPOT_CHECK_SHARE, paramLabel = "F",
            description = "Share of each batch drawn at random as spot checks (default: ${DEFAULT-VALUE}).")
    double spotCheckShare;

    @Option(names = "--budget", defaultValue = "" + Simulation.Plan.DEFAULT_BUDGET, paramLabel = "N",
            description = "Labels at which to stop (default: ${DEFAULT-VALUE}).")
    int budget;

    @Option(names = "--test-fraction", defaultValue = "" + Splits.DEFAULT_TEST_FRACTION, paramLabel = "F",
            description = "Share held out for testing, per class (default: ${DEFAULT-VALUE}).")
    double testFraction;

    @Option(names = "--seeds", defaultValue = "" + Simulation.Plan.DEFAULT_SEEDS, paramLabel = "N",
            description = "Paired repeats, each with its own split and first batch (default: ${DEFAULT-VALUE}).")
    int seeds;

    @Option(names = "--seed", defaultValue = "" + Simulation.Plan.DEFAULT_SEED, paramLabel = "N", description = "Root of the seed tree (default: ${DEFAULT-VALUE}).")
    long seed;

    @Option(names = "--targets", split = ",", defaultValue = "0.9,0.95", paramLabel = "A",
            description = "Test accuracies to report the labels needed for (default: ${DEFAULT-VALUE}).")
    List<Double> targets;

    @Option(names = "--stop-agreement", defaultValue = "" + PoolSettings.DEFAULT_STOP_AGREEMENT, paramLabel = "K",
            description = "Mean agreement (Cohen's kappa) of the last 3 rounds' predictions on the stop set at which"
                    + " they count as settled (default: ${DEFAULT-VALUE}).")
    double stopAgreement;

    @Option(names = "--threads", defaultValue = "" + Simulation.DEFAULT_THREADS, paramLabel = "N",
            description = "Curves (a strategy on a seed) run at once, each on its share of the cores; the results"
                    + " are the same whatever the number (default: ${DEFAULT-VALUE}, whose rounds use every core).")
    int threads;

    @Option(names = "--out", required = true, paramLabel = "DIR", description = "Folder for curves.csv, .svg and .png.")
    Path out;

    @Override
    public Integer call() throws IOException {
        Simulation.checkThreads(threads);
        List<Strategy> chosen = strategies.stream().map(Strategy::parse).distinct().toList();
        PoolSettings settings = PoolSettings.defaults().withBatchSize(batch).withSpotCheckShare(spotCheckShare)
                .withColdStart(ColdStart.Method.parse(coldStart)).withStopAgreement(stopAgreement);
        Simulation.Plan plan = new Simulation.Plan(chosen, seeds, seedLabels, budget, testFraction, settings,
                sampler.config(), seed);
        LabelledSet all = input.read();
        int total = plan.roundsEach() * chosen.size() * seeds;
        ProgressBar bar = new ProgressBar(System.err, "rounds");
        AtomicInteger done = new AtomicInteger();
        List<Simulation.Point> points = Simulation.run(all, null, plan, threads,
                k -> bar.show(done.addAndGet(k), total, done.get()), (seedsDone, so) -> { });
        bar.finish();
        SimulationReport.write(out, input.fileName(), points, plan);
        PrintWriter w = command.commandLine().getOut();
        SimulationReport.summary(w, points, plan, targets);
        w.printf("curves=%s%n", out.resolve(SimulationReport.CSV));
        w.flush();
        return 0;
    }
}
