package dev.dowser;

import dev.dowser.store.Database;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.UserPrincipal;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.Clock;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Optional;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.stream.Stream;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.extension.AfterAllCallback;
import org.junit.jupiter.api.extension.BeforeAllCallback;
import org.junit.jupiter.api.extension.ExtensionContext;

/**
 * A throw-away PostgreSQL cluster for the tests of the PostgreSQL path: Debian's {@code postgresql}
 * package's own initdb and pg_ctl (from {@code /usr/lib/postgresql/VERSION/bin}), a data folder in
 * a temp directory, a loopback port chosen free, trust authentication on loopback only. Each test
 * gets a database of its own ({@link #open}). {@link #close} stops the server and removes the
 * folder; a shutdown hook does the same if the tests never get that far.
 *
 * <p>PostgreSQL refuses to run as root: as root (CI's containers) the cluster belongs to the
 * {@code postgres} account the package creates, through {@code runuser}. Without the package the
 * tests are skipped with a loud message, unless {@code DOWSER_REQUIRE_POSTGRESQL} is set (CI sets
 * it), when they fail.
 */
public final class PostgresServer implements AutoCloseable {

    static final String ROOT = "/usr/lib/postgresql";
    public static final String USER = "dowser";
    private static final long DEADLINE_SECONDS = 120;

    private final Path bin;
    private final Path dir;
    private final boolean asPostgres;
    private final int port;
    private final Thread hook;
    private final AtomicInteger databases = new AtomicInteger();
    private final java.util.Set<String> made = new java.util.HashSet<>();
    private boolean closed;

    private PostgresServer(Path bin, Path dir, boolean asPostgres, int port) {
        this.bin = bin;
        this.dir = dir;
        this.asPostgres = asPostgres;
        this.port = port;
        this.hook = new Thread(this::stopQuietly, "stop-test-postgresql");
        Runtime.getRuntime().addShutdownHook(hook);
    }

    /** The newest installed server's programs, if any. */
    static Optional<Path> binaries() {
        Path root = Path.of(ROOT);
        if (!Files.isDirectory(root)) {
            return Optional.empty();
        }
        try (Stream<Path> versions = Files.list(root)) {
            return versions.map(v -> v.resolve("bin"))
                    .filter(b -> Files.isExecutable(b.resolve("initdb")) && Files.isExecutable(b.resolve("pg_ctl")))
                    .max(Comparator.comparingInt(b -> versionOf(b.getParent())));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private static int versionOf(Path versionDir) {
        try {
            return Integer.parseInt(versionDir.getFileName().toString().replaceAll("\\..*", ""));
        } catch (NumberFormatException e) {
            return -1;
        }
    }

    /** Starts a cluster, or skips the calling tests (loudly) when no PostgreSQL is installed. */
    public static PostgresServer start() throws IOException, InterruptedException {
        Optional<Path> bin = binaries();
        if (bin.isEmpty()) {
            String why = "NO POSTGRESQL SERVER INSTALLED: the tests of the PostgreSQL path need Debian's postgresql"
                    + " package (initdb and pg_ctl under " + ROOT + "/*/bin); ./dowser test installs it when run as root,"
                    + " otherwise: sudo apt-get install postgresql";
            if (System.getenv("DOWSER_REQUIRE_POSTGRESQL") != null) {
                throw new AssertionError(why);
            }
            System.err.println("\n*** SKIPPED: " + why + " ***\n");
            Assumptions.abort(why);
        }
        boolean asPostgres = "root".equals(System.getProperty("user.name"));
        Path dir = Files.createTempDirectory("dowser-pg-");
        if (asPostgres) {
            UserPrincipal postgres = dir.getFileSystem().getUserPrincipalLookupService().lookupPrincipalByName("postgres");
            Files.setOwner(dir, postgres);
        }
        run(bin.get(), asPostgres, dir, "initdb", "-D", dir.resolve("data").toString(), "-U", USER, "-A", "trust",
                "-E", "UTF8", "--no-locale", "--no-sync");
        IOException last = null;
        for (int attempt = 0; attempt < 3; attempt++) {
            int port = freePort();
            try {
                run(bin.get(), asPostgres, dir, "pg_ctl", "-D", dir.resolve("data").toString(), "-l",
                        dir.resolve("server.log").toString(), "-w", "-t", "60", "-o",
                        "-p " + port + " -c listen_addresses=127.0.0.1 -k " + dir + " -c fsync=off", "start");
                return new PostgresServer(bin.get(), dir, asPostgres, port);
            } catch (IOException e) {
                last = e; // the port was taken between the look and the start: try another
            }
        }
        TestSupport.deleteTree(dir);
        throw last;
    }

    private static int freePort() throws IOException {
        try (ServerSocket s = new ServerSocket(0, 1, InetAddress.getLoopbackAddress())) {
            return s.getLocalPort();
        }
    }

    /** Runs one of the server's programs, as postgres when we are root; its output goes into the failure. */
    private static void run(Path bin, boolean asPostgres, Path dir, String program, String... args)
            throws IOException, InterruptedException {
        List<String> command = new ArrayList<>();
        if (asPostgres) {
            command.addAll(List.of("runuser", "-u", "postgres", "--"));
        }
        command.add(bin.resolve(program).toString());
        command.addAll(List.of(args));
        Path out = Files.createTempFile("dowser-pg-out-", ".txt");
        try {
            Process p = new ProcessBuilder(command).directory(dir.toFile()).redirectErrorStream(true)
                    .redirectOutput(out.toFile()).start();
            if (!p.waitFor(DEADLINE_SECONDS, TimeUnit.SECONDS)) {
                p.destroyForcibly();
                throw new IOException(program + " did not finish within " + DEADLINE_SECONDS + " s");
            }
            if (p.exitValue() != 0) {
                String log = Files.isRegularFile(dir.resolve("server.log"))
                        ? Files.readString(dir.resolve("server.log"), StandardCharsets.UTF_8) : "";
                throw new IOException(String.join(" ", command) + " exited with " + p.exitValue() + ": "
                        + Files.readString(out, StandardCharsets.UTF_8) + log);
            }
        } finally {
            Files.deleteIfExists(out);
        }
    }

    public int port() {
        return port;
    }

    public Path folder() {
        return dir;
    }

    public String url(String database) {
        return "jdbc:postgresql://127.0.0.1:" + port + "/" + database;
    }

    /** A new, empty database of this cluster, opened as Dowser opens a shared one (migrations applied). */
    public Database open(Clock clock) {
        return open("t" + databases.incrementAndGet(), clock);
    }

    /**
     * The database that stands for the data folder {@code data} of an H2 test: the same folder
     * gives the same database, so a test that reopens its folder reopens its database.
     */
    public Database open(Path data, Clock clock) {
        return open("f" + Integer.toUnsignedString(data.toAbsolutePath().normalize().toString().hashCode(), 36), clock);
    }

    /**
     * The database called {@code key} (letters and digits), made empty the first time: a test that
     * closes and opens its database again (a restart) gets the same one back.
     */
    public Database open(String key, Clock clock) {
        return Database.connect(create(key), USER, "", clock);
    }

    /**
     * The address of the database called {@code key}, made empty (no tables) the first time, as a
     * team's administrator makes one before Dowser first connects to it.
     */
    public synchronized String create(String key) {
        String name = "d_" + key.toLowerCase(java.util.Locale.ROOT).replaceAll("[^a-z0-9]", "_");
        if (made.add(name)) {
            try (Connection c = DriverManager.getConnection(url("postgres"), USER, "");
                 Statement s = c.createStatement()) {
                s.execute("CREATE DATABASE " + name);
            } catch (SQLException e) {
                throw new AssertionError("cannot make database " + name + ": " + e.getMessage(), e);
            }
        }
        return url(name);
    }

    /**
     * The address of a new database {@code key} owned by the login role {@code role}, which reaches
     * it over TCP only with {@code password} (SCRAM, as a team's server would ask), not as the
     * cluster's other databases are reached (trust).
     */
    public synchronized String createWithPassword(String key, String role, String password)
            throws IOException, InterruptedException {
        String name = "d_" + key.toLowerCase(java.util.Locale.ROOT).replaceAll("[^a-z0-9]", "_");
        try (Connection c = DriverManager.getConnection(url("postgres"), USER, "");
             Statement s = c.createStatement()) {
            s.execute("CREATE ROLE " + role + " LOGIN PASSWORD '" + password.replace("'", "''") + "'");
            s.execute("CREATE DATABASE " + name + " OWNER " + role);
            made.add(name);
            // The first matching line of pg_hba.conf decides; initdb's trust lines come after this one.
            Path hba = dir.resolve("data").resolve("pg_hba.conf");
            Files.writeString(hba, "host " + name + " " + role + " 127.0.0.1/32 scram-sha-256\n" + Files.readString(hba));
            s.execute("SELECT pg_reload_conf()");
        } catch (SQLException e) {
            throw new AssertionError("cannot make database " + name + " for " + role + ": " + e.getMessage(), e);
        }
        String url = url(name);
        dev.dowser.TestSupport.await(java.time.Duration.ofSeconds(DEADLINE_SECONDS), () -> {
            try (Connection c = DriverManager.getConnection(url, role, "")) {
                return false;
            } catch (SQLException refused) {
                return true;
            }
        }, "the server to ask " + role + " for a password after reloading pg_hba.conf");
        return url;
    }

    /** True while the server answers on its port. */
    public boolean running() {
        try (java.net.Socket s = new java.net.Socket(InetAddress.getLoopbackAddress(), port)) {
            return true;
        } catch (IOException e) {
            return false;
        }
    }

    /** Stops the server at once (nothing in it is kept) and removes its folder. */
    @Override
    public synchronized void close() throws IOException, InterruptedException {
        if (closed) {
            return;
        }
        closed = true;
        try {
            run(bin, asPostgres, dir, "pg_ctl", "-D", dir.resolve("data").toString(), "-m", "immediate", "-w", "stop");
        } finally {
            TestSupport.deleteTree(dir);
            try {
                Runtime.getRuntime().removeShutdownHook(hook);
            } catch (IllegalStateException e) {
                // already shutting down: the hook is what is running
            }
        }
    }

    private void stopQuietly() {
        try {
            close();
        } catch (IOException | InterruptedException | RuntimeException e) {
            System.err.println("could not stop the test PostgreSQL in " + dir + ": " + e.getMessage());
        }
    }

    /**
     * One cluster for a test class: {@code @RegisterExtension static final PostgresServer.ForClass
     * PG = new PostgresServer.ForClass();} starts it before the class's first test and closes it
     * after its last, whatever the tests did.
     */
    public static final class ForClass implements BeforeAllCallback, AfterAllCallback {
        private PostgresServer server;

        @Override
        public void beforeAll(ExtensionContext context) throws Exception {
            server = start();
        }

        @Override
        public void afterAll(ExtensionContext context) throws Exception {
            if (server != null) {
                server.close();
                server = null;
            }
        }

        public PostgresServer server() {
            return server;
        }
    }
}
