package dev.dowser.cli;

import java.io.IOException;
import java.io.InputStream;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

/**
 * The long fuzz campaign: the jqwik properties of the test sources tagged {@code bench}
 * ({@code EdgeFuzzTest}: files to import, heads of files to preview, and every JSON body, against
 * the real server and database), run through Maven with fresh random seeds and as many tries as
 * asked, since jqwik is a test library and not part of the jar. Maven's own output goes to
 * standard error; the campaign's counts come back as {@code fuzz_*} lines.
 */
final class FuzzBench {

    /** Properties the campaign runs; the tries are split evenly between them. */
    static final int PROPERTIES = 3;
    static final int FULL_INPUTS = 100_200;
    static final int QUICK_INPUTS = 3_000;

    private FuzzBench() {
    }

    static void run(PrintWriter out, boolean quick) throws IOException, InterruptedException {
        Path project = projectDir();
        int tries = (quick ? QUICK_INPUTS : FULL_INPUTS) / PROPERTIES;
        Path report = Files.createTempFile("dowser-fuzz-", ".txt");
        try {
            List<String> command = List.of("mvn", "-B", "-q", "-Dstyle.color=never", "test", "-Dtest=EdgeFuzzTest",
                    "-Dgroups=bench", "-Ddowser.excludedGroups=", "-Djqwik.tries.default=" + tries,
                    "-Ddowser.fuzz.report=" + report, "-Dsurefire.failIfNoSpecifiedTests=false");
            long started = System.nanoTime();
            Process maven = new ProcessBuilder(command).directory(project.toFile()).redirectErrorStream(true).start();
            try (InputStream log = maven.getInputStream()) {
                log.transferTo(System.err);
            }
            int exit = maven.waitFor();
            out.printf("fuzz_tries_per_property=%d%nfuzz_seconds=%.0f%n", tries, (System.nanoTime() - started) / 1e9);
            for (String line : Files.readAllLines(report)) {
                out.println(line);
            }
            // A 500, a partial write or a Java message fails a property, which stops it and fails Maven.
            out.printf("fuzz_passed=%b%n", exit == 0);
            out.flush();
        } finally {
            Files.deleteIfExists(report);
        }
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
