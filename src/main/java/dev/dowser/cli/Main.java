package dev.dowser.cli;

import picocli.CommandLine;
import picocli.CommandLine.Command;

/** The {@code dowser} command line. */
@Command(name = "dowser",
        mixinStandardHelpOptions = true,
        versionProvider = Version.class,
        description = {
            "Tells a labelling team which records to label next.",
            "",
            "Keeps a pool of records in an embedded database, samples the posterior of a small Bayesian"
                + " neural network, and queues the records whose labels would teach it most.",
            "",
            "Start with: dowser demo"},
        subcommands = {
            ServeCommand.class,
            DemoCommand.class,
            ImportCommand.class,
            ExportCommand.class,
            UsersCommand.class,
            FitCommand.class,
            SimulateCommand.class,
            BenchCommand.class,
            CommandLine.HelpCommand.class})
public final class Main implements Runnable {

    /** Held here: the logging system keeps loggers only weakly, and would forget the level. */
    private static final java.util.logging.Logger NETLIB_LOG = java.util.logging.Logger.getLogger("dev.ludovic.netlib");

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    public static void main(String[] args) {
        // Undertow logs through JBoss Logging; send it to SLF4J so one configuration governs all.
        System.setProperty("org.jboss.logging.provider", "slf4j");
        // The BLAS loader reports each implementation it skips; which one it chose is in `dowser bench`.
        NETLIB_LOG.setLevel(java.util.logging.Level.SEVERE);
        System.exit(commandLine().execute(args));
    }

    /** The configured command line, shared by {@link #main} and the tests. */
    public static CommandLine commandLine() {
        CommandLine cl = new CommandLine(new Main());
        cl.setExecutionExceptionHandler(new ErrorHandler());
        cl.setUsageHelpAutoWidth(true);
        return cl;
    }

    @Override
    public void run() {
        spec.commandLine().usage(spec.commandLine().getOut());
    }
}
