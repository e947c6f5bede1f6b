package dev.dowser.cli;

import java.io.IOException;
import java.io.InputStream;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

/**
 * The long fuzz campaign: the fuzz tests of the test sources tagged {@code bench}
 * ({@code EdgeFuzzTest}: every JSON body, heads of files to preview, and files to import, against
 * the real server and database), run through Maven, since the generators and checks are test code
 * and not part of the jar. One fresh root seed, printed as {@code fuzz_seed}, is the root of every
 * input's seed; a failure names the seed of its smallest failing input. Each property runs in a Maven run of its own, with its share of
 * the inputs: an import costs about ten times a JSON call (it spools a file and makes a pool), so
 * imports get a fifth and go last. Maven's own output goes to standard error; the campaign's counts
 * come back as {@code fuzz_*} lines, summed over the three runs.
 */
final class FuzzBench {

    static final int FULL_INPUTS = 100_200;
    static final int QUICK_INPUTS = 3_000;
    /** The properties in the order they run, each with its share of the inputs in fifths. */
    static final List<Share> SHARES = List.of(new Share("jsonBodiesNeverFailOrWriteHalfAtLength", 2),
            new Share("previewsNeverFailAtLength", 2), new Share("importsNeverFailOrWriteHalfAtLength", 1));

    record Share(String property, int fifths) {
    }

    private FuzzBench() {
    }

    static void run(PrintWriter out, boolean quick) throws IOException, InterruptedException {
        Path project = projectDir();
        int inputs = quick ? QUICK_INPUTS : FULL_INPUTS;
        Map<String, Long> counts = new TreeMap<>();
        boolean passed = true;
        long started = System.nanoTime();
        long seed = new java.util.SplittableRandom().nextLong();
        out.printf("fuzz_seed=%d%n", seed);
        for (Share share : SHARES) {
            int tries = inputs / 5 * share.fifths();
            Path report = Files.createTempFile("dowser-fuzz-", ".txt");
            try {
                List<String> command = List.of("mvn", "-B", "-q", "-Dstyle.color=never", "test",
                        "-Dtest=EdgeFuzzTest#" + share.property(), "-Dgroups=bench", "-Ddowser.excludedGroups=",
                        "-Ddowser.fuzz.tries=" + tries, "-Ddowser.fuzz.seed=" + seed, "-Ddowser.fuzz.report=" + report, "-Ddowser.fuzz.bench=true",
                        "-Dsurefire.failIfNoSpecifiedTests=false");
                long t0 = System.nanoTime();
                Process maven = new ProcessBuilder(command).directory(project.toFile()).redirectErrorStream(true).start();
                try (InputStream log = maven.getInputStream()) {
                    log.transferTo(System.err);
                }
                // A 500, a partial write or a Java message fails a property, which stops it and fails Maven.
                passed &= maven.waitFor() == 0;
                out.printf("fuzz_tries_%s=%d%nfuzz_seconds_%s=%.0f%n", share.property(), tries, share.property(),
                        (System.nanoTime() - t0) / 1e9);
                for (String line : Files.readAllLines(report)) {
                    int eq = line.indexOf('=');
                    if (eq > 0) {
                        counts.merge(line.substring(0, eq), Long.parseLong(line.substring(eq + 1)), Long::sum);
                    }
                }
                out.flush();
            } finally {
                Files.deleteIfExists(report);
            }
        }
        out.printf("fuzz_seconds=%.0f%n", (System.nanoTime() - started) / 1e9);
        counts.forEach((k, v) -> out.println(k + "=" + v));
        out.printf("fuzz_passed=%b%n", passed);
        out.flush();
    }

    /** The source tree the jar was built from: the folder above {@code target/dowser.jar}. */
    static Path projectDir() {
        try {
            Path jar = Path.of(FuzzBench.class.getProtectionDomain().getCodeSource().getLocation().toURI());
            Path dir = jar.getParent() == null ? null : jar.getParent().getParent();
            if (dir == null || !Files.isRegularFile(dir.resolve("pom.xml"))
                    || !Files.isRegularFile(dir.resolve("src/test/java/dev/dowser/web/EdgeFuzzTest.java"))) {
                throw new IllegalArgumentException("the fuzz suite runs the test sources through Maven; run dowser bench"
                        + " from a Dowser source folder (the jar here is " + jar + ")");
            }
            return dir;
        } catch (URISyntaxException e) {
            throw new UncheckedIOException(new IOException("cannot find the jar's folder: " + e.getMessage(), e));
        }
    }
}
