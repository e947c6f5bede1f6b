package dev.dowser.cli;

import dev.dowser.data.LabelledSet;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Simulation;
import dev.dowser.rounds.SimulationReport;
import dev.dowser.rounds.Strategy;
import dev.dowser.sampler.SamplerConfig;
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
            "Runs the whole loop offline with the file's labels acting as the labeller, chains continued"
                + " between rounds as the app does; writes DIR/curves.csv, curves.svg and curves.png, and prints"
                + " a table and labels_to_<target>_<strategy>=N lines."})
final class SimulateCommand implements Callable<Integer> {

    @Spec
    CommandSpec command;

    @Mixin
    LabelledFile input;

    @Option(names = "--strategies", split = ",", defaultValue = "bald,random", paramLabel = "S",
            description = "Strategies: bald, power, batchbald, entropy, random (default: ${DEFAULT-VALUE}).")
    List<String> strategies;

    @Option(names = "--seed-labels", defaultValue = "20", paramLabel = "N",
            description = "Labels to start from, picked by k-means++ (default: ${DEFAULT-VALUE}).")
    int seedLabels;

    @Option(names = "--batch", defaultValue = "10", paramLabel = "B", description = "Labels per round (default: ${DEFAULT-VALUE}).")
    int batch;

    @Option(names = "--budget", defaultValue = "300", paramLabel = "N",
            description = "Labels at which to stop (default: ${DEFAULT-VALUE}).")
    int budget;

    @Option(names = "--test-fraction", defaultValue = "0.3", paramLabel = "F",
            description = "Share held out for testing, per class (default: ${DEFAULT-VALUE}).")
    double testFraction;

    @Option(names = "--seeds", defaultValue = "3", paramLabel = "N", description = "Repeats with other seeds (default: ${DEFAULT-VALUE}).")
    int seeds;

    @Option(names = "--targets", split = ",", defaultValue = "0.9,0.95", paramLabel = "A",
            description = "Test accuracies to report the labels needed for (default: ${DEFAULT-VALUE}).")
    List<Double> targets;

    @Option(names = "--draws", defaultValue = "32", paramLabel = "S",
            description = "Posterior draws per round, over all chains (default: ${DEFAULT-VALUE}).")
    int draws;

    @Option(names = "--reburn-in", defaultValue = "200", paramLabel = "N",
            description = "Steps each chain takes before drawing, each round (default: ${DEFAULT-VALUE}).")
    int reburnIn;

    @Option(names = "--out", required = true, paramLabel = "DIR", description = "Folder for curves.csv, .svg and .png.")
    Path out;

    @Override
    public Integer call() throws IOException {
        List<Strategy> chosen = strategies.stream().map(Strategy::parse).toList();
        SamplerConfig sampler = SamplerConfig.builder().chains(SamplerConfig.DEFAULT_CHAINS, draws)
                .burnInSteps(Math.max(reburnIn, SamplerConfig.DEFAULT_REBURN_IN_STEPS)).reburnInSteps(reburnIn)
                .thinSteps(10).build();
        PoolSettings settings = PoolSettings.defaults().withBatchSize(batch);
        Simulation.Plan plan = new Simulation.Plan(chosen, seeds, seedLabels, budget, testFraction, settings, sampler,
                1);
        LabelledSet all = input.read();
        int total = plan.roundsEach() * chosen.size() * seeds;
        ProgressBar bar = new ProgressBar(System.err, "rounds");
        AtomicInteger done = new AtomicInteger();
        List<Simulation.Point> points = Simulation.run(all, plan, k -> bar.show(done.addAndGet(k), total, done.get()));
        bar.finish();
        SimulationReport.write(out, points, plan);
        PrintWriter w = command.commandLine().getOut();
        SimulationReport.summary(w, points, plan, targets);
        w.printf("curves=%s%n", out.resolve(SimulationReport.CSV));
        w.flush();
        return 0;
    }
}
