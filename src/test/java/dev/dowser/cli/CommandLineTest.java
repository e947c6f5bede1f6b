package dev.dowser.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.json.Json;
import dev.dowser.store.Database;
import dev.dowser.team.Passwords;
import dev.dowser.web.PortBusyException;
import dev.dowser.web.WebConfig;
import dev.dowser.web.WebServer;
import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

/** The commands as a person types them: help for each, and import then export through the real database. */
class CommandLineTest {

    @TempDir
    Path dir;

    /** A command's exit code and what it wrote; other command tests in this package run through it too. */
    record Run(int exit, String out, String err) {
    }

    /** Runs a command in this JVM, as {@code Main} would, capturing both streams. */
    static Run run(String... args) {
        CommandLine cl = Main.commandLine();
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        cl.setOut(new PrintWriter(out));
        cl.setErr(new PrintWriter(err));
        int exit = cl.execute(args);
        return new Run(exit, out.toString(), err.toString());
    }

    @Test
    void everyCommandExplainsItself() {
        for (String command : List.of("serve", "demo", "import", "export", "users", "fit", "simulate", "bench")) {
            // picocli formats descriptions with String.format and complains on System.err about a bare %.
            PrintStream stderr = System.err;
            ByteArrayOutputStream warned = new ByteArrayOutputStream();
            Run r;
            try {
                System.setErr(new PrintStream(warned, true, StandardCharsets.UTF_8));
                r = run(command, "--help");
            } finally {
                System.setErr(stderr);
            }
            assertEquals(0, r.exit(), command);
            assertTrue(r.out().startsWith("Usage: dowser " + command), command + ": " + r.out());
            assertEquals("", warned.toString(StandardCharsets.UTF_8), command + "'s help");
        }
        Run top = run("--help");
        assertEquals(0, top.exit());
        for (String command : List.of("serve", "demo", "import", "export", "users", "fit", "simulate", "bench")) {
            assertTrue(top.out().contains("  " + command + " "), command + " missing from:\n" + top.out());
        }
    }

    /** Each help names the database it opens: users runs on PostgreSQL too; demo and bench make H2 only. */
    @Test
    void helpNamesTheDatabase() {
        String users = run("users", "--help").out().replaceAll("\\s+", " ");
        assertFalse(users.contains("data folder"), "users also runs on PostgreSQL: " + users);
        assertTrue(users.contains("Manages the accounts in the database: the H2 file in --data, or the PostgreSQL"
                + " server given by --database-url."), users);
        assertTrue(run("demo", "--help").out().replaceAll("\\s+", " ")
                .contains("The demo always makes a new H2 database in --data"), "demo's help");
        assertTrue(run("bench", "--help").out().replaceAll("\\s+", " ")
                .contains("makes its own H2 databases under --work; none runs on PostgreSQL"), "bench's help");
    }

    @Test
    void importThenExport() throws Exception {
        Path csv = dir.resolve("in.csv");
        Files.writeString(csv, "id,x,y\na,1,up\nb,2,\nc,3,down\n");
        String data = dir.resolve("data").toString();
        Run imported = run("import", "--data", data, "--pool", "p", "--file", csv.toString(), "--id", "id",
                "--label", "y");
        assertEquals(0, imported.exit(), imported.err());
        assertTrue(imported.out().contains("records=3"), imported.out());
        assertTrue(imported.out().contains("labelled=2"), imported.out());
        assertTrue(imported.out().contains("classes=down,up"), imported.out());

        Path out = dir.resolve("out.csv");
        Run exported = run("export", "--data", data, "--pool", "p", "--out", out.toString());
        assertEquals(0, exported.exit(), exported.err());
        // Labels carried in by the import were never queued: no round, spot check or model view.
        assertEquals(List.of("id,x,label,resolution,labelled_by,labelled_at,note,labels_by_person,round,spot_check,"
                                + "model_label,model_probability",
                        "a,1,up,single,import,carried in by the import,\"{\"\"import\"\":\"\"up\"\"}\",,,,",
                        "c,3,down,single,import,carried in by the import,\"{\"\"import\"\":\"\"down\"\"}\",,,,"),
                Files.readAllLines(out).stream().map(l -> l.replaceAll(",20\\d\\d-[^,]*,", ",")).toList());
        JsonNode meta = Json.tree(Files.readString(dir.resolve("out.csv.meta.json")));
        assertEquals("[{\"name\":\"down\",\"key\":\"1\",\"labelled\":1},{\"name\":\"up\",\"key\":\"2\",\"labelled\":1}]",
                meta.get("classes").toString());
        assertTrue(exported.err().contains("metadata=" + dir.resolve("out.csv.meta.json")), exported.err());
    }

    /** A first look at the label savings: one dataset, a short budget, a cold start named on the command line. */
    @Test
    void theLabelsBenchTakesABudgetAndAColdStart() throws Exception {
        String datasets = dev.dowser.TestSupport.datasetsDir().toString();
        Path out = dir.resolve("labels");
        Run r = run("bench", "--only", "labels", "--datasets", "iris", "--datasets-dir", datasets, "--labels-out",
                out.toString(), "--seeds", "2", "--budget", "12", "--cold-start", "typiclust", "--strategies", "power",
                "--burn-in", "50", "--reburn-in", "20", "--draws", "8", "--chains", "2");
        assertEquals(0, r.exit(), r.err());
        List<String> curve = Files.readAllLines(out.resolve("iris").resolve("curves.csv"));
        assertTrue(curve.stream().anyMatch(l -> l.contains(",12,")), "no point at 12 labels: " + curve);
        assertTrue(curve.stream().noneMatch(l -> l.contains(",18,")), "ran past the budget: " + curve);
        Run tooSmall = run("bench", "--only", "labels", "--datasets", "iris", "--datasets-dir", datasets,
                "--labels-out", out.toString(), "--budget", "3");
        assertEquals(2, tooSmall.exit());
        assertEquals("dowser: iris: the budget (3) must be at least the first batch (6 labels)", tooSmall.err().strip());
    }

    @Test
    void badInputIsOneSentenceAndExitCode2() throws Exception {
        Path csv = dir.resolve("bad.csv");
        Files.writeString(csv, "a,b\n1,2\n3\n");
        Run r = run("import", "--data", dir.resolve("data").toString(), "--pool", "p", "--file", csv.toString(),
                "--classes", "yes,no");
        assertEquals(2, r.exit());
        assertEquals("dowser: line 3: the record has 1 field where the header has 2; quote fields that contain"
                + " commas", r.err().strip());
        Run noClasses = run("import", "--data", dir.resolve("data").toString(), "--pool", "p", "--file", csv.toString());
        assertEquals(2, noClasses.exit());
        assertEquals("dowser: a pool needs classes for people to choose from: name them with --classes a,b,c, or name"
                + " the column that holds labels already given with --label COL", noClasses.err().strip());
        Run noFile = run("import", "--data", dir.resolve("data").toString(), "--pool", "p", "--file",
                dir.resolve("absent.csv").toString(), "--classes", "yes,no");
        assertEquals("dowser: there is no file " + dir.resolve("absent.csv"), noFile.err().strip());
        Run missing = run("export", "--data", dir.resolve("data").toString(), "--pool", "nope");
        assertEquals(2, missing.exit());
        assertEquals("dowser: no pool named 'nope'", missing.err().strip());
    }

    @Test
    void usersAreAddedListedDisabledAndGivenNewPasswords() throws Exception {
        String data = dir.resolve("data").toString();
        Run added = run("users", "add", "Ada Park", "--role", "reviewer", "--data", data);
        assertEquals(0, added.exit(), added.err());
        assertTrue(added.out().startsWith("added Ada Park (reviewer)"), added.out());
        String password = added.out().replaceAll("(?s).*password: (\\S+).*", "$1");
        assertEquals(24, password.length(), "18 random bytes in base64url: " + added.out());

        Run twice = run("users", "add", "Ada Park", "--role", "admin", "--data", data);
        assertEquals(2, twice.exit());
        assertTrue(twice.err().contains("there is already an account named 'Ada Park'"), twice.err());
        Run badRole = run("users", "add", "cy", "--role", "boss", "--data", data);
        assertTrue(badRole.err().contains("unknown role 'boss': use labeller, reviewer or admin"), badRole.err());

        assertEquals(0, run("users", "disable", "Ada Park", "--data", data).exit());
        Run list = run("users", "list", "--data", data);
        assertTrue(list.out().lines().anyMatch(l -> l.startsWith("Ada Park") && l.contains("reviewer")
                && l.contains("disabled")), list.out());

        Run reset = run("users", "reset-password", "Ada Park", "--data", data);
        String fresh = reset.out().replaceAll("(?s).*password: (\\S+).*", "$1");
        try (Database db = Database.open(dir.resolve("data"), Clock.systemUTC())) {
            String stored = db.users().require("Ada Park").passwordHash();
            assertTrue(Passwords.matches(fresh, stored), "the printed password is the stored one");
            assertTrue(!Passwords.matches(password, stored), "the old password no longer works");
            assertTrue(stored.startsWith("pbkdf2-sha256$600000$"), stored);
            assertEquals(List.of("account-added", "account-disabled", "password-reset"),
                    db.history().of(null, "account:Ada Park").stream().map(c -> c.kind()).toList());
        }
    }

    /** The demo moves to a free port when its usual one is busy and says so; a port asked for is kept to. */
    @Test
    void theDemoTakesAFreePortWhenItsOwnIsBusy() throws Exception {
        try (ServerSocket taken = new ServerSocket(0, 1, InetAddress.getLoopbackAddress())) {
            ByteArrayOutputStream note = new ByteArrayOutputStream();
            try (WebServer server = DemoCommand.listen(null, taken.getLocalPort(),
                    new PrintStream(note, true, StandardCharsets.UTF_8))) {
                assertTrue(server.port() != taken.getLocalPort());
                assertEquals("dowser: port " + taken.getLocalPort() + " is busy, so the demo listens on port "
                        + server.port() + " instead (choose one with --port)\n", note.toString(StandardCharsets.UTF_8));
            }
            PortBusyException busy = assertThrows(PortBusyException.class,
                    () -> DemoCommand.listen(taken.getLocalPort(), WebConfig.DEFAULT_PORT, System.err));
            assertEquals("cannot listen on 127.0.0.1 port " + taken.getLocalPort() + ": another program is using it",
                    busy.getMessage());
        }
        Path data = dir.resolve("demo");
        Files.createDirectories(data);
        Files.writeString(data.resolve("keep.txt"), "mine");
        Run full = run("demo", "--data", data.toString(), "--port", "0");
        assertEquals(2, full.exit());
        assertEquals("dowser: " + data + " is not empty; the demo needs a new or empty folder", full.err().strip());
    }
}
