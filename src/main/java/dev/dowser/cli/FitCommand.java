package dev.dowser.cli;

import dev.dowser.advice.ChainAdvice;
import dev.dowser.data.LabelledSet;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.sampler.Health;
import dev.dowser.sampler.HeldOutChoice;
import dev.dowser.sampler.PosteriorSampler;
import dev.dowser.sampler.Predictive;
import dev.dowser.sampler.RoundDraws;
import dev.dowser.stats.Metrics;
import dev.dowser.stats.SeedTree;
import dev.dowser.stats.Splits;
import java.io.IOException;
import java.io.PrintWriter;
import java.util.Arrays;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

@Command(name = "fit", mixinStandardHelpOptions = true,
        description = {"Shows how good a model the labels in a file already give.",
            "Holds out a stratified test split, samples the network's posterior on the rest, and prints"
                + " key=value lines: accuracy, nll, ece (" + Metrics.ECE_BINS + " bins), rhat_max, ess_min, kernel,"
                + " draws, prior_chosen, seconds.",
            "Unless --prior-scale or --temperature is given, the prior's width and the temperature are chosen"
                + " on 15%% of the training rows held out (the lowest held-out NLL), then the posterior is sampled"
                + " on every training row."})
final class FitCommand implements Callable<Integer> {

    static final int PROBE_ROWS = 8;
    /** Branches of the seed's tree. */
    static final int SPLIT = 0;
    static final int CHAINS = 1;
    /** The option that sets what chain advice names. */
    static final java.util.Map<String, String> OPTIONS = java.util.Map.of("draws", "--draws", "chains", "--chains",
            "reburn_in_steps", "--burn-in");

    @Spec
    CommandSpec command;

    @Mixin
    LabelledFile input;

    @Mixin
    SamplerOptions sampler;

    @Option(names = "--test-fraction", defaultValue = "" + Splits.DEFAULT_TEST_FRACTION, paramLabel = "F",
            description = "Share held out for testing, per class (default: ${DEFAULT-VALUE}).")
    double testFraction;

    @Option(names = "--seed", defaultValue = "1", paramLabel = "N", description = "Seed (default: ${DEFAULT-VALUE}).")
    long seed;

    @Override
    public Integer call() throws IOException {
        LabelledSet all = input.read();
        int classes = all.classes().size();
        SeedTree seeds = SeedTree.of(seed);
        Splits.Split split = Splits.stratified(all.labels(), classes, testFraction, seeds.child(SPLIT).rng());
        LabelledSet train = all.subset(split.train());
        LabelledSet test = all.subset(split.test());
        float[] probe = Arrays.copyOf(test.x(), Math.min(PROBE_ROWS, test.rows()) * test.cols());
        long begun = System.nanoTime();
        var parsed = command.commandLine().getParseResult();
        // An explicit prior scale or temperature is the user's choice; otherwise the training rows choose them.
        boolean choose = !parsed.hasMatchedOption("--prior-scale") && !parsed.hasMatchedOption("--temperature");
        RoundDraws draws;
        String chosen = null;
        if (choose) {
            HeldOutChoice d = HeldOutChoice.defaults();
            HeldOutChoice choice = new HeldOutChoice(d.candidates(), d.heldOutFraction(), d.minHeldOutRows(),
                    parsed.hasMatchedOption("--map-steps") ? sampler.mapSteps : d.mapSteps());
            HeldOutChoice.Chosen c = choice.sample(sampler.config(), train.x(), train.labels(), classes, probe,
                    seeds.child(CHAINS));
            draws = c.draws();
            chosen = c.why();
        } else {
            draws = new PosteriorSampler(sampler.config()).sample(train.x(), train.labels(), classes, null, probe,
                    seeds.child(CHAINS));
        }
        float[] p = Predictive.meanProbabilities(draws.layout(), draws.draws(), test.x(), test.rows());
        Health h = draws.health();
        PrintWriter out = command.commandLine().getOut();
        out.printf("train_rows=%d%ntest_rows=%d%naccuracy=%.4f%nnll=%.4f%nece=%.4f%nrhat_max=%s%n"
                        + "ess_min=%s%nrhat_within_max=%s%ness_within_min=%s%nkernel=%s%nkernel_why=%s%ndraws=%d%ndivergences=%d%n",
                train.rows(), test.rows(), Metrics.accuracy(p, test.labels(), classes),
                Metrics.nll(p, test.labels(), classes), Metrics.ece(p, test.labels(), classes),
                figure(h.rhatMax(), "%.3f"), figure(Math.min(h.essBulkMin(), h.essTailMin()), "%.1f"),
                figure(h.rhatWithinMax(), "%.3f"), figure(h.essWithinMin(), "%.1f"),
                draws.choice().kernel().word(), draws.choice().why(), draws.draws().size(), h.divergences());
        // Only an accept-reject kernel has an acceptance rate; the others have none to print.
        if (!Double.isNaN(h.acceptance())) {
            out.printf("acceptance=%.3f%n", h.acceptance());
        }
        if (chosen != null) {
            out.println("prior_chosen=" + chosen);
        }
        // The whole fit, with the candidates' fits when the prior was chosen.
        out.printf("seconds=%.2f%n", (System.nanoTime() - begun) / 1e9);
        ChainAdvice advice = ChainAdvice.of(h.rhatMax(), h.essBulkMin(), h.essTailMin(), h.rhatWithinMax(),
                h.essWithinMin(), sampler.chains,
                sampler.draws, new ChainAdvice.Knobs(sampler.chains, sampler.draws, sampler.burnIn,
                        PoolSettings.Sampling.MAX_CHAINS, PoolSettings.Sampling.MAX_DRAWS,
                        PoolSettings.Sampling.MAX_REBURN_IN_STEPS));
        out.println("advice=" + advice.summary());
        for (ChainAdvice.Point a : advice.points()) {
            out.println("advice=" + a.text() + (a.setting() == null ? ""
                    : " (try " + OPTIONS.get(a.setting()) + " " + a.suggest() + ")"));
        }
        out.flush();
        return 0;
    }

    /** A diagnostic figure, or {@code none} where the draws were too few to judge it: never NaN. */
    static String figure(double v, String format) {
        return Double.isFinite(v) ? String.format(java.util.Locale.ROOT, format, v) : "none";
    }
}
