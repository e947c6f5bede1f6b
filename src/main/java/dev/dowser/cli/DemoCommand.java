package dev.dowser.cli;

import dev.dowser.data.ImportResult;
import dev.dowser.demo.DemoPool;
import dev.dowser.store.Database;
import dev.dowser.team.Accounts;
import dev.dowser.team.Role;
import dev.dowser.team.TeamConfig;
import dev.dowser.web.WebConfig;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.SecureRandom;
import java.time.Clock;
import java.util.concurrent.Callable;
import java.util.stream.Stream;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

@Command(name = "demo", mixinStandardHelpOptions = true,
        description = {"Starts the web app on a fresh database holding the demo pool.",
            "The pool holds vibration traces from the pumps of Kettlewater Works, an invented water works,"
                + " each to be labelled with one of five conditions."})
final class DemoCommand implements Callable<Integer> {

    static final String DEMO_ADMIN = "demo-admin";
    static final String DEMO_LABELLER = "demo-labeller";

    @Option(names = "--port", defaultValue = "" + WebConfig.DEFAULT_PORT, paramLabel = "P",
            description = "TCP port (default: ${DEFAULT-VALUE}).")
    int port;

    @Option(names = "--data", paramLabel = "DIR",
            description = "A new or empty folder for the demo database (default: a new temporary folder).")
    Path dir;

    @Option(names = "--records", defaultValue = "" + DemoPool.DEFAULT_RECORDS, paramLabel = "N",
            description = "Readings in the demo pool (default: ${DEFAULT-VALUE}).")
    int records;

    @Option(names = "--seed", defaultValue = "" + DemoPool.DEFAULT_SEED, paramLabel = "N",
            description = "Seed of the invented readings (default: ${DEFAULT-VALUE}).")
    long seed;

    @Override
    public Integer call() throws IOException {
        if (records < 1) {
            throw new IllegalArgumentException("--records must be at least 1, got " + records);
        }
        Path folder = fresh(dir);
        // Each step says what it does as it starts: a newcomer sees progress, not a silent terminal.
        progress("opening a new database in " + folder.toAbsolutePath());
        Database db = Database.open(folder, Clock.systemUTC());
        progress(String.format(java.util.Locale.ROOT, "writing %,d invented pump readings and importing them", records));
        ImportResult r = DemoPool.load(db, folder, records, seed);
        // The demo signs in like any server: an admin and a labeller with fresh passwords, printed below.
        Accounts accounts = new Accounts(db, new SecureRandom(), TeamConfig.defaults());
        String adminPassword = UsersCommand.generatePassword(new SecureRandom());
        String labellerPassword = UsersCommand.generatePassword(new SecureRandom());
        progress("making the accounts " + DEMO_ADMIN + " and " + DEMO_LABELLER);
        accounts.add(DEMO_ADMIN, Role.ADMIN, adminPassword, "demo");
        accounts.add(DEMO_LABELLER, Role.LABELLER, labellerPassword, "demo");
        WebConfig config = new WebConfig(WebConfig.DEFAULT_BIND, port, WebConfig.DEFAULT_MAX_UPLOAD_BYTES,
                folder.resolve("uploads"));
        progress("starting the server and the first round");
        // The first round (a batch spread over the pool by k-means++) is ready before anyone looks.
        ServerRunner.runUntilStopped(db, config, "Dowser demo: " + r.records() + " pump readings in pool '"
                + r.poolName() + "'\nLabel at  {address}desk.html?pool=" + r.poolName()
                + "\nOverview  {address}overview.html?pool=" + r.poolName()
                + "\nSign in as " + DEMO_ADMIN + " / " + adminPassword + "  or  " + DEMO_LABELLER + " / "
                + labellerPassword
                + "\n(data: " + folder.toAbsolutePath() + "; Ctrl-C stops)", server -> server.requestRound(r.poolName()));
        return 0;
    }

    private static void progress(String step) {
        System.err.println("dowser demo: " + step + "…");
    }

    private static Path fresh(Path dir) throws IOException {
        if (dir == null) {
            return Files.createTempDirectory("dowser-demo-");
        }
        if (Files.exists(dir)) {
            try (Stream<Path> entries = Files.list(dir)) {
                if (entries.findAny().isPresent()) {
                    throw new IllegalArgumentException(dir + " is not empty; the demo needs a new or empty folder");
                }
            } catch (IOException e) {
                throw new UncheckedIOException("cannot read " + dir + ": " + e.getMessage(), e);
            }
        }
        return Files.createDirectories(dir);
    }
}
