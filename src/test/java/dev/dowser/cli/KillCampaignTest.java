package dev.dowser.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.FileTime;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Acknowledged means durable (issue 11): the real jar serves as its own process while four
 * labellers, a reviewer and an admin write as fast as they can; it is killed with SIGKILL three
 * times at random moments and restarted on the same folder. Every label, withdrawal, review,
 * settings change and account change that was answered with success must be in the database, and
 * once the first batch is served the desk never answers without a record, before or after a kill.
 * The long campaign (25 kills) is {@code dowser bench --only durability}.
 */
class KillCampaignTest {

    /** Where the build puts the jar ({@code ./dowser test} builds it first when the sources are newer). */
    static final String JAR_PROPERTY = "dowser.jar";

    @TempDir
    Path dir;

    @Test
    void everyAcknowledgedWriteSurvivesSigkill() throws Exception {
        KillCampaign campaign = new KillCampaign(3, 4, 60, 120, 11);
        StringWriter log = new StringWriter();
        KillCampaign.Report r = campaign.run(dir, List.of(javaBinary(), "-Xmx512m", "-jar", jar().toString()),
                new PrintWriter(log));
        String counts = r.check().counts().entrySet().stream()
                .map(e -> e.getKey() + " " + e.getValue()[0] + "/" + e.getValue()[1] + " lost").toList() + "\n" + log;
        assertEquals(List.of(), r.check().missing(), "acknowledged writes lost after SIGKILL: " + counts);
        assertEquals(0, r.serverErrors(), "the server answered 5xx: " + counts);
        // The desk keeps serving across kills: its queue, leases and reserve are in the database.
        assertEquals(0, r.empty(), "empty desks (of " + (r.offered() + r.empty()) + " answers) while "
                + campaign.records() + " records were mostly unlabelled, the first: " + r.firstEmpty() + "\n" + log);
        // A campaign that wrote little would prove little: each kind must have been tried.
        for (var e : r.check().counts().entrySet()) {
            assertTrue(e.getValue()[0] > 0, "no " + e.getKey() + " was acknowledged: " + counts);
        }
    }

    /** The jar the launcher runs, refused when older than the sources it is built from. */
    static Path jar() throws IOException {
        String property = System.getProperty(JAR_PROPERTY);
        Path jar = property == null ? null : Path.of(property);
        if (jar == null || !Files.isRegularFile(jar)) {
            throw new IllegalStateException("no jar at " + jar + "; run the tests with ./dowser test, which builds it");
        }
        FileTime built = Files.getLastModifiedTime(jar);
        for (String source : List.of("src/main", "web", "migrations", "pom.xml")) {
            try (Stream<Path> files = Files.walk(Path.of(source))) {
                Path newer = files.filter(Files::isRegularFile)
                        .filter(f -> lastModified(f).compareTo(built) > 0).findFirst().orElse(null);
                if (newer != null) {
                    throw new IllegalStateException(newer + " is newer than " + jar
                            + "; run the tests with ./dowser test, which rebuilds the jar");
                }
            }
        }
        return jar;
    }

    private static FileTime lastModified(Path f) {
        try {
            return Files.getLastModifiedTime(f);
        } catch (IOException e) {
            throw new IllegalStateException("cannot read the time of " + f + ": " + e.getMessage(), e);
        }
    }

    static String javaBinary() {
        return Path.of(System.getProperty("java.home"), "bin", "java").toString();
    }
}
