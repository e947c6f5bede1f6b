package dev.dowser.cli;

import dev.dowser.data.ImportProgress;
import dev.dowser.data.ImportResult;
import dev.dowser.demo.DemoPool;
import dev.dowser.store.Database;
import dev.dowser.team.Accounts;
import dev.dowser.team.Role;
import dev.dowser.team.TeamConfig;
import dev.dowser.web.PortBusyException;
import dev.dowser.web.WebConfig;
import dev.dowser.web.WebServer;
import java.io.IOException;
import java.io.PrintStream;
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
                + " each to be labelled with one of five conditions.",
            "The demo always makes a new H2 database in --data; for PostgreSQL, use import and serve with"
                + " --database-url."})
final class DemoCommand implements Callable<Integer> {

    static final String DEMO_ADMIN = "demo-admin";
    static final String DEMO_LABELLER = "demo-labeller";

    @Option(names = "--port", paramLabel = "P", description = "TCP port (default: " + WebConfig.DEFAULT_PORT
            + ", or a free one when that is busy).")
    Integer port;

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
        checkFresh(dir);
        // The port first: a busy one is found before any folder is made.
        WebServer server = listen(port, WebConfig.DEFAULT_PORT, System.err);
        Path folder = ServerRunner.orClose(server, () -> {
            try {
                return fresh(dir);
            } catch (IOException e) {
                throw new UncheckedIOException("cannot make the demo's folder: " + e.getMessage(), e);
            }
        });
        System.err.println("dowser: making the demo pool: " + records + " invented pump readings");
        Database db = ServerRunner.orClose(server, () -> Database.open(folder, Clock.systemUTC()));
        ImportResult r;
        String adminPassword = UsersCommand.generatePassword(new SecureRandom());
        String labellerPassword = UsersCommand.generatePassword(new SecureRandom());
        try {
            Path csv = DemoPool.write(folder, records, seed);
            System.err.println("dowser: readings written to " + csv.getFileName() + "; storing them in the database");
            r = DemoPool.store(db, csv, ImportProgress.NONE);
            System.err.println("dowser: " + r.records() + " readings stored; making the two demo accounts");
            // The demo signs in like any server: an admin and a labeller with fresh passwords, printed below.
            Accounts accounts = new Accounts(db, new SecureRandom(), TeamConfig.defaults());
            accounts.add(DEMO_ADMIN, Role.ADMIN, adminPassword, "demo");
            accounts.add(DEMO_LABELLER, Role.LABELLER, labellerPassword, "demo");
        } catch (RuntimeException e) {
            server.close();
            db.close();
            throw e;
        }
        System.err.println("dowser: starting the server; the first round runs in the background");
        // The first round (the most typical record of each cluster of the pool) is ready before anyone looks.
        ServerRunner.runUntilStopped(server, db, folder, "Dowser demo: " + r.records() + " pump readings in pool '"
                + r.poolName() + "'\nLabel at  {address}desk.html?pool=" + r.poolName()
                + "\nOverview  {address}overview.html?pool=" + r.poolName()
                + "\nSign in as " + DEMO_ADMIN + " / " + adminPassword + "  or  " + DEMO_LABELLER + " / "
                + labellerPassword
                + "\n(data: " + folder.toAbsolutePath() + "; Ctrl-C stops)", s -> s.requestRound(r.poolName()));
        return 0;
    }

    /**
     * Binds {@code port}, or when none is given {@code usual}, falling back to any free port when
     * that one is busy and saying so on {@code note}.
     */
    static WebServer listen(Integer port, int usual, PrintStream note) {
        WebConfig config = new WebConfig(WebConfig.DEFAULT_BIND, port == null ? usual : port,
                WebConfig.DEFAULT_MAX_UPLOAD_BYTES, Path.of(ServerRunner.UPLOADS));
        try {
            return WebServer.listen(config);
        } catch (PortBusyException busy) {
            if (port != null) {
                throw busy;
            }
            WebServer server = WebServer.listen(config.withPort(0));
            note.println("dowser: port " + usual + " is busy, so the demo listens on port " + server.port()
                    + " instead (choose one with --port)");
            return server;
        }
    }

    /** Refuses a --data folder that is not new or empty before anything else happens. */
    private static void checkFresh(Path dir) {
        if (dir == null || !Files.exists(dir)) {
            return;
        }
        try (Stream<Path> entries = Files.list(dir)) {
            if (entries.findAny().isPresent()) {
                throw new IllegalArgumentException(dir + " is not empty; the demo needs a new or empty folder");
            }
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read " + dir + ": " + e.getMessage(), e);
        }
    }

    private static Path fresh(Path dir) throws IOException {
        return dir == null ? Files.createTempDirectory("dowser-demo-") : Files.createDirectories(dir);
    }
}
