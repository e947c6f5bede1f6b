package dev.dowser.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.TestSupport;
import dev.dowser.json.Json;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.store.Database;
import dev.dowser.store.RoundStatus;
import dev.dowser.store.RoundStore;
import dev.dowser.team.Role;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Path;
import java.time.Clock;
import java.time.Duration;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Rounds recover (issue 11 item 3), with the real jar as its own process. A pool imported before
 * the server starts gets its first round without anyone asking; killed (SIGKILL) during that round,
 * the server leaves it recorded as running, and the next start marks it interrupted and runs a
 * round at once. Stopped (SIGTERM) during a round once a batch is nearly labelled, the server stops
 * it at a safe point, and the next start refills the short queue at once.
 */
class RestartTest {

    static final Duration DEADLINE = Duration.ofSeconds(120);

    @TempDir
    Path dir;

    final HttpClient http = HttpClient.newHttpClient();
    String lead;
    String ana;

    @Test
    void roundsLeftRunningAreInterruptedAndShortQueuesRefilledAtStart() throws Exception {
        Path data = dir.resolve("data");
        prepare(data);
        List<String> launcher = List.of(KillCampaignTest.javaBinary(), "-Xmx512m", "-jar", KillCampaignTest.jar().toString());
        Path log = dir.resolve("server.log");

        try (ServerProcess server = ServerProcess.start(launcher, data, log)) {
            TestSupport.await(DEADLINE, () -> latest(server).path("status").asText().equals("running"),
                    "the first round, started by the server itself");
            server.kill();
        }
        try (Database db = Database.open(data, Clock.systemUTC())) {
            assertEquals(RoundStatus.RUNNING, latestRound(db).status(), "a killed server cannot record anything");
        }

        int stopped;
        try (ServerProcess server = ServerProcess.start(launcher, data, log)) {
            TestSupport.await(DEADLINE, () -> served(server) >= 2, "a round at once after the restart");
            JsonNode rounds = get(server, "pools/p/rounds").get("rounds");
            JsonNode first = rounds.get(rounds.size() - 1);
            assertEquals("interrupted", first.get("status").asText());
            assertTrue(first.get("message").asText().contains("killed"), first.toString());
            // Label the served batch until the desk starts the next round by itself, then stop the server in it.
            // The longest re-burn-in makes that round last long after the signal: at the default a round of
            // 67 labels ended in 1.5 s, before SIGTERM came, on a loaded machine.
            put(server, lead, "pools/p/settings", "{\"reburn_in_steps\":" + PoolSettings.Sampling.MAX_REBURN_IN_STEPS + "}");
            int before = latest(server).get("round").asInt();
            while (latest(server).get("round").asInt() == before) {
                JsonNode next = post(server, ana, "pools/p/queue/next", "{}", 200);
                post(server, ana, "pools/p/labels", "{\"record\":\"" + next.at("/record/id").asText()
                        + "\",\"label\":\"" + (next.at("/record/id").asText().hashCode() % 2 == 0 ? "odd" : "even")
                        + "\"}", 201);
            }
            stopped = latest(server).get("round").asInt();
            int exit = server.terminate(Duration.ofSeconds(60));
            assertTrue(exit == 0 || exit == 143, "exit status " + exit);
        }
        try (Database db = Database.open(data, Clock.systemUTC())) {
            RoundStore.RoundRow last = latestRound(db);
            assertEquals(stopped, last.round());
            assertEquals(RoundStatus.STOPPED, last.status(), "a round ended by SIGTERM stops at a safe point: " + last);
            db.pools().updateSettings(db.pools().require("p").id(), PoolSettings.defaults().toJson(), "test");
        }

        try (ServerProcess server = ServerProcess.start(launcher, data, log)) {
            try {
                TestSupport.await(DEADLINE, () -> latest(server).get("round").asInt() > stopped
                        && latest(server).get("status").asText().equals("published"), "a round at once for the short queue");
            } catch (AssertionError e) {
                throw new AssertionError(e.getMessage() + "; rounds: " + get(server, "pools/p/rounds") + "; queue: "
                        + get(server, "pools/p/queue") + "; server log:\n" + java.nio.file.Files.readString(log), e);
            }
            assertEquals(200, http.send(request(server, lead, "pools/p/queue/next").POST(HttpRequest.BodyPublishers
                    .ofString("{}")).build(), HttpResponse.BodyHandlers.ofString()).statusCode());
        }
    }

    /** A pool of 3,000 records with 60 labels carried in (so rounds sample, and take a moment), and two accounts. */
    private void prepare(Path data) {
        StringBuilder csv = new StringBuilder("id,a,b,c,d,e,f,label\n");
        SplittableRandom rng = new SplittableRandom(3);
        for (int i = 0; i < 3_000; i++) {
            csv.append('k').append(i);
            double sum = 0;
            for (int f = 0; f < 6; f++) {
                double v = rng.nextGaussian();
                sum += v;
                csv.append(',').append(v);
            }
            csv.append(',').append(i < 60 ? (sum > 0 ? "odd" : "even") : "").append('\n');
        }
        try (Database db = Database.open(data, Clock.systemUTC())) {
            TestSupport.importText(db, "p", csv.toString(), TestSupport.csv("p").withId("id").withLabel("label"));
            lead = TestSupport.tokenFor(db, "lead", Role.ADMIN);
            ana = TestSupport.tokenFor(db, "ana", Role.LABELLER);
        }
    }

    private static RoundStore.RoundRow latestRound(Database db) {
        return db.rounds().latest(db.pools().require("p").id()).orElseThrow();
    }

    private JsonNode latest(ServerProcess server) throws Exception {
        JsonNode rounds = get(server, "pools/p/rounds").get("rounds");
        return rounds.isEmpty() ? Json.object() : rounds.get(0);
    }

    private int served(ServerProcess server) throws Exception {
        return get(server, "pools/p/rounds").path("served_round").asInt(0);
    }

    private HttpRequest.Builder request(ServerProcess server, String token, String path) {
        return HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + server.port() + "/api/v1/" + path))
                .header("Authorization", "Bearer " + token).timeout(Duration.ofSeconds(30));
    }

    private JsonNode get(ServerProcess server, String path) throws Exception {
        HttpResponse<String> r = http.send(request(server, lead, path).GET().build(), HttpResponse.BodyHandlers.ofString());
        assertEquals(200, r.statusCode(), r.body());
        return Json.tree(r.body());
    }

    private void put(ServerProcess server, String token, String path, String body) throws Exception {
        HttpResponse<String> r = http.send(request(server, token, path).PUT(HttpRequest.BodyPublishers.ofString(body))
                .build(), HttpResponse.BodyHandlers.ofString());
        assertEquals(200, r.statusCode(), r.body());
    }

    private JsonNode post(ServerProcess server, String token, String path, String body, int expected) throws Exception {
        HttpResponse<String> r = http.send(request(server, token, path).POST(HttpRequest.BodyPublishers.ofString(body))
                .build(), HttpResponse.BodyHandlers.ofString());
        assertEquals(expected, r.statusCode(), r.body());
        return Json.tree(r.body());
    }
}
