package dev.dowser.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.PostgresServer;
import dev.dowser.TestSupport;
import dev.dowser.cli.CommandLineTest.Run;
import dev.dowser.json.Json;
import dev.dowser.store.Database;
import dev.dowser.team.Role;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.extension.RegisterExtension;
import org.junit.jupiter.api.io.TempDir;

/**
 * A team's Dowser on a real PostgreSQL server, through the command line as people run it: the
 * database made beforehand with a password-only account, {@code users}, {@code import},
 * {@code serve} and {@code export} given {@code --database-url}/{@code --database-user} and the
 * password in {@code DOWSER_DATABASE_PASSWORD}. Iris (Fisher 1936, sklearn's copy from Debian's
 * python3-sklearn) goes in through HTTP, a few records are labelled, the server is killed
 * (SIGKILL) right after the last label is acknowledged, and the next server on the same database
 * still has every acknowledged label. Nothing lands in the H2 file of the data folder.
 */
class ServeOnPostgresqlTest {

    @RegisterExtension
    static final PostgresServer.ForClass PG = new PostgresServer.ForClass();

    static final Duration DEADLINE = Duration.ofSeconds(120);
    static final String ROLE = "team_lead";
    static final String PASSWORD = "not on the command line";

    @TempDir
    Path dir;

    final HttpClient http = HttpClient.newHttpClient();

    @Test
    void acknowledgedLabelsOnPostgresqlSurviveAKilledServer() throws Exception {
        String url = PG.server().createWithPassword("team", ROLE, PASSWORD);
        Path data = dir.resolve("data");
        Map<String, String> env = Map.of(DataOption.PASSWORD_VARIABLE, PASSWORD);
        String[] serveOn = {"--database-url", url, "--database-user", ROLE};
        String[] on = {"--database-url", url, "--database-user", ROLE, "--data", data.toString()};

        Run added = jar(env, "users", "add", "ana", "--role", "labeller", on);
        assertEquals(0, added.exit(), added.err());
        String lead;
        String ana;
        try (Database db = Database.connect(url, ROLE, PASSWORD, Clock.systemUTC())) {
            lead = TestSupport.tokenFor(db, "lead", Role.ADMIN);
            ana = new dev.dowser.team.Accounts(db, new java.security.SecureRandom(), TestSupport.FAST_TEAM)
                    .newToken(new dev.dowser.team.Caller("ana", Role.LABELLER, null, null), "test");
        }
        Run listed = jar(env, "users", "list", on);
        assertEquals(0, listed.exit(), listed.err());
        assertTrue(listed.out().contains("ana") && listed.out().contains("lead"), listed.out());

        TestSupport.OpenDataset iris = TestSupport.openDataset("iris", dir);
        List<String> launcher = List.of(KillCampaignTest.javaBinary(), "-Xmx512m", "-jar", KillCampaignTest.jar().toString());
        Path log = dir.resolve("server.log");
        Map<String, String> acknowledged = new LinkedHashMap<>();
        try (ServerProcess server = ServerProcess.start(launcher, data, log, env, serveOn)) {
            HttpResponse<String> imported = send(server, lead, "imports?pool=iris&file_name=iris.csv&features=f0,f1,f2,f3"
                    + "&classes=setosa,versicolor,virginica&wait=true", HttpRequest.BodyPublishers.ofFile(iris.csv()));
            assertEquals(201, imported.statusCode(), imported.body());
            send(server, lead, "pools/iris/rounds", HttpRequest.BodyPublishers.noBody());
            TestSupport.await(DEADLINE, () -> Json.tree(send(server, lead, "pools/iris/rounds", null).body())
                    .path("served_round").asInt(0) >= 1, "the first round on PostgreSQL to be served");
            String[] classes = {"setosa", "versicolor", "virginica"};
            for (int i = 0; i < 5; i++) {
                HttpResponse<String> next = send(server, ana, "pools/iris/queue/next", HttpRequest.BodyPublishers.ofString("{}"));
                assertEquals(200, next.statusCode(), next.body());
                String id = Json.tree(next.body()).at("/record/id").asText();
                HttpResponse<String> labelled = send(server, ana, "pools/iris/labels", HttpRequest.BodyPublishers
                        .ofString("{\"record\":\"" + id + "\",\"label\":\"" + classes[i % 3] + "\"}"));
                assertEquals(201, labelled.statusCode(), labelled.body());
                acknowledged.put(id, classes[i % 3]);
            }
            server.kill();
        }
        assertEquals(5, acknowledged.size(), acknowledged.toString());
        assertFalse(Database.exists(data), "nothing may go to the H2 file of the data folder");

        Run importedAlso = jar(env, "import", "--pool", "iris2", "--file", iris.csv().toString(), "--features",
                "f0,f1,f2,f3", "--classes", "setosa,versicolor,virginica", on);
        assertEquals(0, importedAlso.exit(), importedAlso.err());
        try (ServerProcess server = ServerProcess.start(launcher, data, log, env, serveOn)) {
            String pools = send(server, lead, "pools", null).body();
            assertTrue(pools.contains("\"iris\"") && pools.contains("\"iris2\""), pools);
            Path out = dir.resolve("iris-labels.jsonl");
            Run exported = jar(env, "export", "--pool", "iris", "--format", "jsonl", "--out", out.toString(), on);
            assertEquals(0, exported.exit(), exported.err());
            Map<String, String> found = new LinkedHashMap<>();
            for (String line : Files.readAllLines(out, StandardCharsets.UTF_8)) {
                JsonNode row = Json.tree(line);
                found.put(row.get("id").asText(), row.get("label").asText());
            }
            assertEquals(acknowledged, found, "every acknowledged label, and only those, after the kill; server log:\n"
                    + Files.readString(log));
        }
        assertFalse(Database.exists(data), "nothing may go to the H2 file of the data folder");
    }

    @Test
    void aWrongAddressOrAFailedConnectionIsNamedWithItsCause() throws Exception {
        Run mysql = CommandLineTest.run("users", "list", "--database-url", "jdbc:mysql://127.0.0.1/team", "--database-user", ROLE);
        assertEquals(ErrorHandler.EXIT_INPUT, mysql.exit());
        assertEquals("dowser: --database-url takes a PostgreSQL address, jdbc:postgresql://HOST:PORT/DB, not"
                + " jdbc:mysql://127.0.0.1/team; change it to that form, or leave the option out to use the H2"
                + " database in --data\n", mysql.err());

        Run inUrl = CommandLineTest.run("export", "--pool", "p", "--database-url", PG.server().url("team") + "?password=x",
                "--database-user", ROLE);
        assertEquals(ErrorHandler.EXIT_INPUT, inUrl.exit());
        assertTrue(inUrl.err().contains("take password=... out of the address and set the environment variable "
                + "DOWSER_DATABASE_PASSWORD instead"), inUrl.err());

        Run noUser = CommandLineTest.run("export", "--pool", "p", "--database-url", PG.server().url("team"));
        assertEquals(ErrorHandler.EXIT_INPUT, noUser.exit());
        assertEquals("dowser: --database-url needs --database-user NAME, the PostgreSQL account to connect as\n",
                noUser.err());

        Run userAlone = CommandLineTest.run("users", "list", "--database-user", ROLE, "--data", dir.toString());
        assertEquals(ErrorHandler.EXIT_INPUT, userAlone.exit());
        assertTrue(userAlone.err().startsWith("dowser: --database-user is for a PostgreSQL server"), userAlone.err());
        assertFalse(Database.exists(dir), "a refused command writes nothing");

        String url = PG.server().createWithPassword("guarded", "guard", PASSWORD);
        Run wrong = jar(Map.of(DataOption.PASSWORD_VARIABLE, "a wrong password"), "users", "list",
                "--database-url", url, "--database-user", "guard", "--data", dir.resolve("d").toString());
        assertEquals(ErrorHandler.EXIT_INPUT, wrong.exit(), wrong.err());
        assertTrue(wrong.err().startsWith("dowser: cannot connect to the database at " + url + ": "), wrong.err());
        assertTrue(wrong.err().contains("password authentication failed for user \"guard\""), wrong.err());
        assertFalse(wrong.err().contains("a wrong password"), wrong.err());

        String nobody = "jdbc:postgresql://127.0.0.1:" + closedPort() + "/team";
        Run refused = CommandLineTest.run("users", "list", "--database-url", nobody, "--database-user", ROLE, "--data",
                dir.resolve("d").toString());
        assertEquals(ErrorHandler.EXIT_INPUT, refused.exit());
        assertTrue(refused.err().startsWith("dowser: cannot connect to the database at " + nobody + ": "), refused.err());
        assertTrue(refused.err().contains("refused"), refused.err());
    }

    @Test
    void helpExplainsTheDatabaseOptions() {
        for (String command : List.of("serve", "import", "export", "users")) {
            Run help = CommandLineTest.run(command, "--help");
            String text = help.out().replaceAll("\\s+", " ");
            assertTrue(text.contains("--database-url=URL") && text.contains("--database-user=NAME")
                    && text.contains("jdbc:postgresql://HOST:PORT/DB") && text.contains("DOWSER_DATABASE_PASSWORD"),
                    command + ": " + help.out());
        }
    }

    private static int closedPort() throws java.io.IOException {
        try (java.net.ServerSocket s = new java.net.ServerSocket(0, 1, java.net.InetAddress.getLoopbackAddress())) {
            return s.getLocalPort();
        }
    }

    /** The jar as its own process (so the password is in its environment, as a person would set it). */
    private Run jar(Map<String, String> env, String command, Object... args) throws Exception {
        List<String> cmd = new ArrayList<>(List.of(KillCampaignTest.javaBinary(), "-jar", KillCampaignTest.jar().toString(),
                command));
        for (Object a : args) {
            if (a instanceof String[] many) {
                cmd.addAll(List.of(many));
            } else {
                cmd.add((String) a);
            }
        }
        Path out = Files.createTempFile(dir, "out-", ".txt");
        Path err = Files.createTempFile(dir, "err-", ".txt");
        ProcessBuilder builder = new ProcessBuilder(cmd).redirectOutput(out.toFile()).redirectError(err.toFile());
        builder.environment().remove(DataOption.PASSWORD_VARIABLE);
        builder.environment().putAll(env);
        Process p = builder.start();
        if (!p.waitFor(DEADLINE.toSeconds(), TimeUnit.SECONDS)) {
            p.destroyForcibly();
            p.waitFor();
            throw new AssertionError(cmd + " did not end within " + DEADLINE.toSeconds() + " s");
        }
        return new Run(p.exitValue(), Files.readString(out), Files.readString(err));
    }

    private HttpResponse<String> send(ServerProcess server, String token, String path, HttpRequest.BodyPublisher body)
            throws Exception {
        HttpRequest.Builder r = HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + server.port() + "/api/v1/" + path))
                .header("Authorization", "Bearer " + token).timeout(Duration.ofSeconds(60));
        return http.send(body == null ? r.GET().build() : r.POST(body).build(), HttpResponse.BodyHandlers.ofString());
    }
}
