package dev.dowser;

import dev.dowser.data.FileFormat;
import dev.dowser.data.ImportProgress;
import dev.dowser.data.ImportResult;
import dev.dowser.data.ImportSpec;
import dev.dowser.data.Importer;
import dev.dowser.data.LabelledSet;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.store.Database;
import dev.dowser.team.Accounts;
import dev.dowser.team.Caller;
import dev.dowser.team.Role;
import dev.dowser.team.TeamConfig;
import dev.dowser.web.WebConfig;
import dev.dowser.web.WebServer;
import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.SecureRandom;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/** Shared helpers of the tests: databases, the open datasets, and files to import. */
public final class TestSupport {

    /** A fixed instant, so stored times are predictable. */
    public static final Instant NOW = Instant.parse("2026-12-02T09:30:00Z");
    public static final Clock CLOCK = Clock.fixed(NOW, ZoneOffset.UTC);
    /** Where {@code ./dowser test} unpacks the open datasets (set by the build). */
    public static final String DATASETS_PROPERTY = "dowser.datasets";

    private TestSupport() {
    }

    /** A sampler small enough for a round in well under a second: 16 hidden units, 2 chains, 8 draws. */
    public static SamplerConfig quickSampler() {
        return SamplerConfig.builder().hidden(List.of(16)).chains(2, 8).burnInSteps(100).reburnInSteps(50)
                .thinSteps(5).build();
    }

    /** Accounts as the server keeps them, with few PBKDF2 iterations so tests that sign in stay quick. */
    public static final TeamConfig FAST_TEAM = TeamConfig.defaults().withIterations(1_000);

    /**
     * The server most web tests run: a loopback port chosen by the system, the quick sampler, fast
     * password hashing, and uploads up to {@code maxUploadBytes} spooled under {@code dir}/uploads.
     */
    public static WebServer quickServer(Database db, Path dir, long maxUploadBytes) {
        return WebServer.start(db, new WebConfig("127.0.0.1", 0, maxUploadBytes, dir.resolve("uploads")),
                quickSampler(), FAST_TEAM);
    }
    public static final String TEST_PASSWORD = "test-password-1";

    /** Adds an account (password {@link #TEST_PASSWORD}) and returns a fresh API token for it. */
    public static String tokenFor(Database db, String name, Role role) {
        Accounts accounts = new Accounts(db, new SecureRandom(), FAST_TEAM);
        accounts.add(name, role, TEST_PASSWORD, "test");
        return accounts.newToken(new Caller(name, role, null, null), "test");
    }

    /** Something a test waits for; it may throw, which fails the wait at once. */
    @FunctionalInterface
    public interface Condition {
        boolean holds() throws Exception;
    }

    /** How often {@link #await} looks again. */
    static final Duration POLL = Duration.ofMillis(20);

    /**
     * Waits until {@code condition} holds, looking every 20 ms; fails after {@code deadline}, naming
     * {@code what} was awaited. The one way tests wait: none waits without end.
     */
    public static void await(Duration deadline, Condition condition, String what) {
        long until = System.nanoTime() + deadline.toNanos();
        try {
            while (!condition.holds()) {
                if (System.nanoTime() - until > 0) {
                    throw new AssertionError("waited " + deadline.toSeconds() + " s for " + what + "; it never came");
                }
                Thread.sleep(POLL.toMillis());
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new AssertionError("interrupted while waiting for " + what, e);
        } catch (Exception e) {
            throw new AssertionError("failed while waiting for " + what + ": " + e.getMessage(), e);
        }
    }

    /** Deletes a folder and everything in it, deepest first. */
    public static void deleteTree(Path dir) throws IOException {
        try (java.util.stream.Stream<Path> paths = Files.walk(dir)) {
            for (Path p : paths.sorted(java.util.Comparator.reverseOrder()).toList()) {
                Files.deleteIfExists(p);
            }
        }
    }

    public static Database openDb(Path dir) {
        return Database.open(dir, CLOCK);
    }

    /** A clock the test moves by hand, for leases and expiries. */
    public static final class MutableClock extends Clock {

        private volatile Instant now = NOW;

        public void advance(Duration d) {
            now = now.plus(d);
        }

        @Override
        public java.time.ZoneId getZone() {
            return ZoneOffset.UTC;
        }

        @Override
        public Clock withZone(java.time.ZoneId zone) {
            return this;
        }

        @Override
        public Instant instant() {
            return now;
        }
    }

    public static ImportResult importText(Database db, String pool, String text, ImportSpec spec) {
        return new Importer(db).run(new ByteArrayInputStream(text.getBytes(StandardCharsets.UTF_8)), pool + ".csv",
                spec, ImportProgress.NONE);
    }

    public static ImportResult importBytes(Database db, byte[] bytes, ImportSpec spec) {
        return new Importer(db).run(new ByteArrayInputStream(bytes), "fuzz", spec, ImportProgress.NONE);
    }

    public static ImportSpec csv(String pool) {
        return ImportSpec.defaults(pool, FileFormat.CSV);
    }

    public static ImportSpec jsonl(String pool) {
        return ImportSpec.defaults(pool, FileFormat.JSONL);
    }

    /**
     * Rows in every table of the database, to show that a failed operation changed nothing.
     * Covers every table Flyway created, so a new table is checked without editing this.
     */
    public static Map<String, Long> tableCounts(Path dataDir) {
        String url = "jdbc:h2:file:" + dataDir.toAbsolutePath().resolve(Database.FILE_STEM);
        Map<String, Long> counts = new LinkedHashMap<>();
        try (Connection c = java.sql.DriverManager.getConnection(url, "dowser", "");
             Statement s = c.createStatement()) {
            List<String> tables = new ArrayList<>();
            try (ResultSet rs = s.executeQuery("SELECT table_name FROM information_schema.tables"
                    + " WHERE table_schema = 'PUBLIC' ORDER BY table_name")) {
                while (rs.next()) {
                    tables.add(rs.getString(1));
                }
            }
            for (String t : tables) {
                try (ResultSet rs = s.executeQuery("SELECT COUNT(*) FROM \"" + t + "\"")) {
                    rs.next();
                    counts.put(t, rs.getLong(1));
                }
            }
        } catch (SQLException e) {
            throw new IllegalStateException(e);
        }
        return counts;
    }

    // ---- a reference network -------------------------------------------------------------

    /**
     * Log class probabilities of one row, log softmax(z), the network written out with plain loops
     * in double straight from the layout's definition: the reference the fast code is checked against.
     */
    public static double[] referenceLogProbabilities(dev.dowser.model.Layout layout, double[] theta, float[] x,
                                                     int row) {
        dev.dowser.model.Architecture a = layout.architecture();
        double[] h = new double[a.inputs()];
        for (int i = 0; i < h.length; i++) {
            h[i] = x[row * a.inputs() + i];
        }
        for (int l = 0; l < a.layers(); l++) {
            double[] z = new double[a.fanOut(l)];
            for (int j = 0; j < z.length; j++) {
                double v = theta[layout.biasOffset(l) + j];
                for (int i = 0; i < h.length; i++) {
                    v += h[i] * theta[layout.weightOffset(l) + i * z.length + j];
                }
                boolean hidden = l < a.layers() - 1;
                z[j] = !hidden ? v : a.activation() == dev.dowser.model.Activation.RELU ? Math.max(0, v) : Math.tanh(v);
            }
            h = z;
        }
        double max = Double.NEGATIVE_INFINITY;
        for (double v : h) {
            max = Math.max(max, v);
        }
        double sum = 0;
        for (double v : h) {
            sum += Math.exp(v - max);
        }
        double lse = max + Math.log(sum);
        for (int c = 0; c < h.length; c++) {
            h[c] -= lse;
        }
        return h;
    }

    // ---- the open datasets -----------------------------------------------------------------

    /** One of the UCI datasets shipped by Debian's python3-sklearn 1.2.1, rewritten with a header. */
    public record OpenDataset(String name, Path csv, int rows, int features, List<String> classes) {
    }

    public static Path datasetsDir() {
        String dir = System.getProperty(DATASETS_PROPERTY);
        Path p = dir == null ? null : Path.of(dir);
        if (p == null || !Files.isRegularFile(p.resolve(".complete"))) {
            throw new IllegalStateException("the open datasets are missing from " + p
                    + "; run the tests with ./dowser test, which unpacks them from Debian's python3-sklearn");
        }
        return p;
    }

    /**
     * Rewrites one of sklearn's bundled files as a CSV with a header row: columns {@code f0..fN}
     * and {@code label} holding the class name. sklearn's format has a first line giving the row
     * count, the feature count and the class names, then rows of features and the class index;
     * digits has no first line and 64 pixel columns then the digit.
     */
    public static OpenDataset openDataset(String name, Path workDir) {
        Path out = workDir.resolve(name + ".csv");
        try {
            dev.dowser.simulate.BenchmarkData.OpenCsv open = dev.dowser.simulate.BenchmarkData.sklearnCsv(name,
                    datasetsDir());
            Files.writeString(out, open.csv());
            return new OpenDataset(name, out, (int) open.csv().lines().count() - 1, open.features(), open.classes());
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** Iris (Fisher 1936, sklearn's copy) imported as the pool "iris" with its four features and without its labels; row r's class is r / 50. */
    public static void importIrisWithoutLabels(Database db, Path workDir) {
        OpenDataset iris = openDataset("iris", workDir);
        try (InputStream in = Files.newInputStream(iris.csv())) {
            new Importer(db).run(in, "iris.csv", csv("iris").withFeatures(List.of("f0", "f1", "f2", "f3"))
                    .withClasses(List.of("setosa", "versicolor", "virginica")), ImportProgress.NONE);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** One of the open datasets with all its labels, as the model sees it (read as a pool would be, in memory). */
    public static LabelledSet labelledOpenDataset(String name, Path workDir) {
        return dev.dowser.simulate.BenchmarkData.load(name, datasetsDir()).pool();
    }

}
