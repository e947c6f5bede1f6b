package dev.dowser.cli;

import dev.dowser.data.LabelledSet;
import dev.dowser.model.Activation;
import dev.dowser.model.Prior;
import dev.dowser.sampler.Health;
import dev.dowser.sampler.KernelChoice;
import dev.dowser.sampler.PosteriorSampler;
import dev.dowser.sampler.Predictive;
import dev.dowser.sampler.RoundDraws;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.stats.Metrics;
import dev.dowser.stats.SeedTree;
import dev.dowser.stats.Splits;
import java.io.IOException;
import java.io.PrintWriter;
import java.util.Arrays;
import java.util.List;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

@Command(name = "fit", mixinStandardHelpOptions = true,
        description = {"Shows how good a model the labels in a file already give.",
            "Holds out a stratified test split, samples the network's posterior on the rest, and prints"
                + " key=value lines: accuracy, nll, ece (15 bins), rhat_max, ess_min, kernel, draws, seconds."})
final class FitCommand implements Callable<Integer> {

    static final int PROBE_ROWS = 8;

    @Spec
    CommandSpec command;

    @Mixin
    LabelledFile input;

    @Option(names = "--test-fraction", defaultValue = "0.3", paramLabel = "F",
            description = "Share held out for testing, per class (default: ${DEFAULT-VALUE}).")
    double testFraction;

    @Option(names = "--seed", defaultValue = "1", paramLabel = "N", description = "Seed (default: ${DEFAULT-VALUE}).")
    long seed;

    @Option(names = "--hidden", split = ",", defaultValue = "128", paramLabel = "N",
            description = "Hidden layer widths, e.g. 128 or 64,64 (default: ${DEFAULT-VALUE}).")
    List<Integer> hidden;

    @Option(names = "--activation", defaultValue = "relu", paramLabel = "relu|tanh",
            description = "Hidden nonlinearity (default: ${DEFAULT-VALUE}).")
    String activation;

    @Option(names = "--chains", defaultValue = "" + SamplerConfig.DEFAULT_CHAINS, paramLabel = "K", description = "Chains (default: ${DEFAULT-VALUE}).")
    int chains;

    @Option(names = "--draws", defaultValue = "" + SamplerConfig.DEFAULT_DRAWS, paramLabel = "S",
            description = "Draws kept over all chains (default: ${DEFAULT-VALUE}).")
    int draws;

    @Option(names = "--kernel", defaultValue = "auto", paramLabel = "auto|sgld|psgld|mala",
            description = "Sampler kernel (default: ${DEFAULT-VALUE}: MALA up to "
                    + SamplerConfig.DEFAULT_MALA_MAX_ROWS + " training rows, preconditioned SGLD beyond).")
    String kernel;

    @Option(names = "--burn-in", defaultValue = "" + SamplerConfig.DEFAULT_BURN_IN_STEPS, paramLabel = "N",
            description = "Burn-in steps per chain (default: ${DEFAULT-VALUE}).")
    int burnIn;

    @Option(names = "--thin", defaultValue = "" + SamplerConfig.DEFAULT_THIN_STEPS, paramLabel = "N",
            description = "Steps between kept draws (default: ${DEFAULT-VALUE}).")
    int thin;

    @Option(names = "--learning-rate", defaultValue = "" + SamplerConfig.DEFAULT_LEARNING_RATE, paramLabel = "ETA",
            description = "Step size eps = 2 ETA / N (default: ${DEFAULT-VALUE}).")
    double learningRate;

    @Option(names = "--prior-scale", defaultValue = "" + Prior.DEFAULT_WEIGHT_SCALE, paramLabel = "S",
            description = "Weight prior N(0, (S / sqrt(fan-in))^2) (default: ${DEFAULT-VALUE}).")
    double priorScale;

    @Option(names = "--hierarchical", description = "Sample each layer's weight precision (Gamma hyperprior).")
    boolean hierarchical;

    @Option(names = "--temperature", defaultValue = "1", paramLabel = "T",
            description = "Posterior temperature; 1 is the true posterior (default: ${DEFAULT-VALUE}).")
    double temperature;

    @Override
    public Integer call() throws IOException {
        LabelledSet all = input.read();
        int classes = all.classes().size();
        Splits.Split split = Splits.stratified(all.labels(), classes, testFraction, seed);
        LabelledSet train = all.subset(split.train());
        LabelledSet test = all.subset(split.test());
        SamplerConfig config = SamplerConfig.builder().kernel(KernelChoice.parse(kernel)).hidden(hidden)
                .activation(Activation.valueOf(activation.toUpperCase(java.util.Locale.ROOT)))
                .prior(new Prior(priorScale, Prior.DEFAULT_BIAS_SCALE, hierarchical, Prior.DEFAULT_HYPER_SHAPE))
                .chains(chains, draws).burnInSteps(burnIn).thinSteps(thin).learningRate(learningRate)
                .temperature(temperature).build();
        float[] probe = Arrays.copyOf(test.x(), Math.min(PROBE_ROWS, test.rows()) * test.cols());
        RoundDraws sample = new PosteriorSampler(config).sample(train.x(), train.labels(), classes, null, probe,
                SeedTree.of(seed));
        float[] p = Predictive.meanProbabilities(sample.layout(), sample.draws(), test.x(), test.rows());
        Health h = sample.health();
        PrintWriter out = command.commandLine().getOut();
        out.printf("train_rows=%d%ntest_rows=%d%naccuracy=%.4f%nnll=%.4f%nece=%.4f%nrhat_max=%.3f%n"
                        + "ess_min=%.1f%nkernel=%s%nkernel_why=%s%ndraws=%d%ndivergences=%d%nacceptance=%.3f%n"
                        + "seconds=%.2f%n",
                train.rows(), test.rows(), Metrics.accuracy(p, test.labels(), classes),
                Metrics.nll(p, test.labels(), classes), Metrics.ece(p, test.labels(), classes),
                h.rhatMax(), Math.min(h.essBulkMin(), h.essTailMin()), sample.choice().kernel().word(),
                sample.choice().why(), sample.draws().size(), h.divergences(), h.acceptance(), sample.seconds());
        for (String a : h.advice()) {
            out.println("advice=" + a);
        }
        out.flush();
        return 0;
    }
}
