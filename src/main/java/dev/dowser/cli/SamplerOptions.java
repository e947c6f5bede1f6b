package dev.dowser.cli;

import dev.dowser.model.Activation;
import dev.dowser.model.Architecture;
import dev.dowser.model.Prior;
import dev.dowser.sampler.KernelChoice;
import dev.dowser.sampler.SamplerConfig;
import java.util.List;
import picocli.CommandLine.Option;

/** How the posterior is sampled, as options shared by {@code fit} and {@code simulate}; defaults are the app's. */
final class SamplerOptions {

    @Option(names = "--kernel", defaultValue = SamplerConfig.DEFAULT_KERNEL_WORD, paramLabel = "auto|sgld|psgld|mala|sghmc",
            description = "Sampler kernel (default: ${DEFAULT-VALUE}: MALA up to "
                    + SamplerConfig.DEFAULT_MALA_MAX_ROWS + " labelled rows, preconditioned SGLD beyond).")
    String kernel;

    @Option(names = "--hidden", split = ",", defaultValue = "" + Architecture.DEFAULT_HIDDEN, paramLabel = "N",
            description = "Hidden layer widths, e.g. 128 or 64,64 (default: ${DEFAULT-VALUE}).")
    List<Integer> hidden;

    @Option(names = "--activation", defaultValue = SamplerConfig.DEFAULT_ACTIVATION_WORD, paramLabel = "relu|tanh",
            description = "Hidden nonlinearity (default: ${DEFAULT-VALUE}).")
    String activation;

    @Option(names = "--chains", defaultValue = "" + SamplerConfig.DEFAULT_CHAINS, paramLabel = "K",
            description = "Chains (default: ${DEFAULT-VALUE}).")
    int chains;

    @Option(names = "--draws", defaultValue = "" + SamplerConfig.DEFAULT_DRAWS, paramLabel = "S",
            description = "Draws kept over all chains (default: ${DEFAULT-VALUE}).")
    int draws;

    @Option(names = "--burn-in", defaultValue = "" + SamplerConfig.DEFAULT_BURN_IN_STEPS, paramLabel = "N",
            description = "Steps each new chain takes before its first draw (default: ${DEFAULT-VALUE}).")
    int burnIn;

    @Option(names = "--reburn-in", defaultValue = "" + SamplerConfig.DEFAULT_REBURN_IN_STEPS, paramLabel = "N",
            description = "Steps a continued chain takes before its first draw each round (default: ${DEFAULT-VALUE}).")
    int reburnIn;

    @Option(names = "--thin", defaultValue = "" + SamplerConfig.DEFAULT_THIN_STEPS, paramLabel = "N",
            description = "Steps between kept draws (default: ${DEFAULT-VALUE}).")
    int thin;

    @Option(names = "--learning-rate", defaultValue = "" + SamplerConfig.DEFAULT_LEARNING_RATE, paramLabel = "ETA",
            description = "Step size eps = 2 ETA / N for N labelled rows (default: ${DEFAULT-VALUE}).")
    double learningRate;

    @Option(names = "--prior-scale", defaultValue = "" + Prior.DEFAULT_WEIGHT_SCALE, paramLabel = "S",
            description = "Weight prior N(0, (S / sqrt(fan-in))^2) (default: ${DEFAULT-VALUE}).")
    double priorScale;

    @Option(names = "--hierarchical", description = "Sample each layer's weight precision (Gamma hyperprior).")
    boolean hierarchical;

    @Option(names = "--temperature", defaultValue = "" + SamplerConfig.DEFAULT_TEMPERATURE, paramLabel = "T",
            description = "Posterior temperature; 1 is the true posterior (default: ${DEFAULT-VALUE}).")
    double temperature;

    @Option(names = "--map-steps", defaultValue = "" + SamplerConfig.DEFAULT_MAP_STEPS, paramLabel = "N",
            description = "Adam steps that carry each new chain to a mode before it samples (default: ${DEFAULT-VALUE}).")
    int mapSteps;

    @Option(names = "--cyclical", description = "A cyclical step schedule, one cycle per draw of a chain (Zhang et al."
            + " 2020), instead of a constant step.")
    boolean cyclical;

    SamplerConfig config() {
        return SamplerConfig.builder().kernel(KernelChoice.parse(kernel)).hidden(hidden)
                .activation(Activation.parse(activation))
                .prior(new Prior(priorScale, Prior.DEFAULT_BIAS_SCALE, hierarchical, Prior.DEFAULT_HYPER_SHAPE))
                .chains(chains, draws).burnInSteps(burnIn).reburnInSteps(reburnIn).thinSteps(thin)
                .learningRate(learningRate).temperature(temperature).mapSteps(mapSteps)
                .cycles(cyclical ? draws / chains : 0).build();
    }
}
