package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.TestSupport;
import dev.dowser.json.Json;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.store.Database;
import dev.dowser.team.Role;
import java.io.BufferedReader;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The desk's calls over real HTTP on the real server: leases, skip, label, undo, settings, the
 * file preview and the event stream. The pool is UCI iris (Fisher 1936, as shipped by Debian's
 * python3-sklearn 1.2.1) with one known label per class.
 */
class DeskApiTest {

    @TempDir
    Path dir;
    Database db;
    WebServer server;
    final HttpClient http = HttpClient.newHttpClient();
    /** API tokens: the admin "lead" and the labellers p1, p2, p3. */
    final Map<String, String> tokens = new HashMap<>();

    @BeforeEach
    void start() throws Exception {
        db = TestSupport.openDb(dir.resolve("db"));
        SamplerConfig quick = TestSupport.quickSampler();
        server = WebServer.start(db, new WebConfig("127.0.0.1", 0, 1 << 22, dir.resolve("uploads")), quick,
                TestSupport.FAST_TEAM);
        tokens.put("lead", TestSupport.tokenFor(db, "lead", Role.ADMIN));
        for (String p : List.of("p1", "p2", "p3")) {
            tokens.put(p, TestSupport.tokenFor(db, p, Role.LABELLER));
        }
        List<String> lines = Files.readAllLines(TestSupport.openDataset("iris", dir).csv());
        StringBuilder csv = new StringBuilder(lines.get(0)).append('\n');
        for (int i = 1; i < lines.size(); i++) {
            String line = lines.get(i);
            // Rows 1, 51 and 101 open the three classes: keep their labels, drop the rest.
            csv.append(i % 50 == 1 ? line : line.substring(0, line.lastIndexOf(',') + 1)).append('\n');
        }
        HttpResponse<String> up = send("POST", "/api/v1/imports?pool=iris&file_name=iris.csv&label=label&wait=true",
                csv.toString());
        assertEquals(201, up.statusCode(), up.body());
        assertEquals(202, send("POST", "/api/v1/pools/iris/rounds", "").statusCode());
        long pool = db.pools().require("iris").id();
        TestSupport.await(Duration.ofSeconds(60), () -> db.queues().servedRound(pool).isPresent(), "the first round");
    }

    @AfterEach
    void stop() {
        server.close();
        db.close();
    }

    /** Sends as the admin. */
    private HttpResponse<String> send(String method, String path, String body) throws Exception {
        return as("lead", method, path, body);
    }

    private HttpResponse<String> as(String person, String method, String path, String body) throws Exception {
        return http.send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + server.port() + path))
                .header("Authorization", "Bearer " + tokens.get(person))
                .method(method, HttpRequest.BodyPublishers.ofString(body)).build(), HttpResponse.BodyHandlers.ofString());
    }

    private JsonNode ok(HttpResponse<String> r, int status) {
        assertEquals(status, r.statusCode(), r.body());
        return Json.tree(r.body());
    }

    @Test
    void leasesSkipLabelAndUndo() throws Exception {
        JsonNode a = ok(as("p1", "POST", "/api/v1/pools/iris/queue/next", "{}"), 200);
        JsonNode b = ok(as("p2", "POST", "/api/v1/pools/iris/queue/next", "{}"), 200);
        String recordA = a.at("/record/id").asText();
        assertNotEquals(recordA, b.at("/record/id").asText(), "one record handed to two people");
        assertTrue(a.at("/belief/mean").size() == 3 && a.at("/belief/sd").size() == 3, a.toString());
        assertEquals(1, a.at("/progress/served_round").asInt());

        assertTrue(a.get("record").path("label").isMissingNode(), "the desk shows nobody's label: " + a);
        // Asking again gives the same person the record they hold.
        assertEquals(recordA, ok(as("p1", "POST", "/api/v1/pools/iris/queue/next", "{}"), 200)
                .at("/record/id").asText());
        // A skip frees it for the next person at once.
        ok(as("p1", "POST", "/api/v1/pools/iris/queue/skip", "{\"round\":" + a.get("round").asInt()
                + ",\"position\":" + a.get("position").asInt() + "}"), 200);
        assertEquals(recordA, ok(as("p3", "POST", "/api/v1/pools/iris/queue/next", "{}"), 200)
                .at("/record/id").asText());

        JsonNode labelled = ok(as("p3", "POST", "/api/v1/pools/iris/labels",
                "{\"record\":\"" + recordA + "\",\"label\":\"setosa\",\"note\":\"petals small\"}"), 201);
        assertEquals("p3", labelled.get("labelled_by").asText(), "a label is given in the signed-in name");
        assertEquals("setosa", labelled.get("label").asText());
        assertEquals(9, labelled.at("/progress/labels_to_next_round").asInt());

        HttpResponse<String> notTheirs = as("p1", "POST", "/api/v1/pools/iris/labels/undo",
                "{\"record\":\"" + recordA + "\"}");
        assertEquals(409, notTheirs.statusCode());
        // Issue 11: the refusal named p3's label, which defeats blind double labelling.
        assertEquals("{\"error\":\"you have no label on this record to take back\"}", notTheirs.body());
        assertFalse(notTheirs.body().contains("setosa") || notTheirs.body().contains("p3"), notTheirs.body());

        JsonNode undone = ok(as("p3", "POST", "/api/v1/pools/iris/labels/undo",
                "{\"record\":\"" + recordA + "\"}"), 200);
        assertEquals("setosa", undone.get("withdrawn").asText());
        assertTrue(undone.at("/record/label").isNull(), undone.toString());
        assertEquals(10, undone.at("/progress/labels_to_next_round").asInt());
        // The record is unlabelled again and back with the one who took the label back.
        assertEquals(recordA, ok(as("p3", "POST", "/api/v1/pools/iris/queue/next", "{}"), 200)
                .at("/record/id").asText());
        HttpResponse<String> twice = as("p3", "POST", "/api/v1/pools/iris/labels/undo",
                "{\"record\":\"" + recordA + "\"}");
        assertEquals(409, twice.statusCode());
        assertEquals("{\"error\":\"you have no label on this record to take back\"}", twice.body(),
                "the same words when nobody has a label on it");
        String export = send("GET", "/api/v1/pools/iris/export?format=csv", "").body();
        assertFalse(export.contains("p3"), "a withdrawn label was exported");
        assertEquals(3, ok(send("GET", "/api/v1/pools/iris", ""), 200).get("classes").findValues("labelled").stream()
                .mapToLong(JsonNode::asLong).sum(), "only the three labels of the file remain");
    }

    /**
     * A client that never got the answer to an acknowledged label (a 503 from a later step, a dropped
     * connection) sends it again: the label is stored once, the round counter counts it once, and the
     * history shows one row. A changed note or class is a new label, as before.
     */
    @Test
    void aRetriedLabelIsStoredOnce() throws Exception {
        String record = ok(as("p1", "POST", "/api/v1/pools/iris/queue/next", "{}"), 200).at("/record/id").asText();
        String body = "{\"record\":\"" + record + "\",\"label\":\"setosa\",\"note\":\"small petals\"}";
        JsonNode first = ok(as("p1", "POST", "/api/v1/pools/iris/labels", body), 201);
        JsonNode retry = ok(as("p1", "POST", "/api/v1/pools/iris/labels", body), 201);
        assertEquals(9, first.at("/progress/labels_to_next_round").asInt());
        assertEquals(9, retry.at("/progress/labels_to_next_round").asInt(), "the retry was counted again: " + retry);
        assertEquals(first.get("labelled_at").asText(), retry.get("labelled_at").asText(),
                "the retry answers with the label it already stored");
        JsonNode history = ok(send("GET", "/api/v1/pools/iris/records/" + record + "/history", ""), 200);
        assertEquals(1, history.get("history").size(), "the retried label was stored twice: " + history);

        ok(as("p1", "POST", "/api/v1/pools/iris/labels", body.replace("small petals", "very small petals")), 201);
        assertEquals(2, ok(send("GET", "/api/v1/pools/iris/records/" + record + "/history", ""), 200)
                .get("history").size(), "a changed note is kept");
        String export = send("GET", "/api/v1/pools/iris/export?format=csv", "").body();
        assertEquals(1, export.lines().filter(l -> l.startsWith(record + ",")).count(), export);
    }

    @Test
    void settingsAreValidatedAndNamed() throws Exception {
        HttpResponse<String> zero = send("PUT", "/api/v1/pools/iris/settings", "{\"batch_size\":0}");
        assertEquals(400, zero.statusCode());
        assertEquals("batch_size (labels per round) must be 1 to 1000, got 0", Json.tree(zero.body()).get("error").asText(),
                "the API's own field names, not the code's");
        HttpResponse<String> unknown = send("PUT", "/api/v1/pools/iris/settings", "{\"colour\":\"red\"}");
        assertEquals(400, unknown.statusCode());
        assertTrue(unknown.body().contains("unknown setting 'colour'"), unknown.body());
        HttpResponse<String> word = send("PUT", "/api/v1/pools/iris/settings", "{\"lease_minutes\":\"ten\"}");
        assertTrue(word.body().contains("'lease_minutes' must be a whole number"), word.body());
        JsonNode changed = ok(send("PUT", "/api/v1/pools/iris/settings", "{\"batch_size\":4,\"strategy\":\"power\"}"), 200);
        assertEquals(4, changed.get("batch_size").asInt());
        assertEquals("power", changed.get("strategy").asText());
        assertEquals(10, changed.get("lease_minutes").asInt());
        assertEquals(4, ok(send("GET", "/api/v1/pools/iris/rounds", ""), 200).get("labels_to_next_round").asInt());
        // The sampler's settings follow the server's until set; draws must split evenly over the chains.
        HttpResponse<String> uneven = send("PUT", "/api/v1/pools/iris/settings", "{\"chains\":4,\"draws\":30}");
        assertEquals(400, uneven.statusCode());
        assertEquals("draws must be a multiple of the chains (4) from 4 to 512, so every chain keeps as many; got 30",
                Json.tree(uneven.body()).get("error").asText());
        HttpResponse<String> lax = send("PUT", "/api/v1/pools/iris/settings", "{\"stop_agreement\":0.5}");
        assertEquals("stop_agreement (the agreement at which predictions count as settled) must lie between 0.9 and 1,"
                + " got 0.5", Json.tree(lax.body()).get("error").asText());
        JsonNode sampling = ok(send("PUT", "/api/v1/pools/iris/settings", "{\"draws\":16,\"reburn_in_steps\":100}"), 200);
        assertEquals(16, sampling.get("draws").asInt());
        assertEquals(100, sampling.get("reburn_in_steps").asInt());
        assertEquals(TestSupport.quickSampler().chains().count(), sampling.get("chains").asInt(), "the server's, kept");
        // The true posterior stays one setting away from the cold default.
        assertEquals(SamplerConfig.COLD_POSTERIOR_TEMPERATURE, sampling.get("temperature").asDouble());
        JsonNode warm = ok(send("PUT", "/api/v1/pools/iris/settings", "{\"temperature\":1}"), 200);
        assertEquals(1.0, warm.get("temperature").asDouble());
        assertEquals(16, warm.get("draws").asInt(), "the pool's own draws, kept");
        HttpResponse<String> frozen = send("PUT", "/api/v1/pools/iris/settings", "{\"temperature\":0}");
        assertEquals(400, frozen.statusCode());
        assertEquals("temperature must lie between 0.01 and 1.0 (1 samples the true posterior, 0.1 is the default cold"
                + " posterior), got 0.0", Json.tree(frozen.body()).get("error").asText());
    }

    /** Every setting, cold start and temperature included, goes through the API and is kept in the same shape. */
    @Test
    void everySettingRoundTripsThroughTheApi() throws Exception {
        JsonNode before = ok(send("GET", "/api/v1/pools/iris/settings", ""), 200);
        assertEquals("typiclust", before.get("cold_start").asText());
        String every = "{\"batch_size\":7,\"spot_check_share\":0.25,\"lease_minutes\":12,\"strategy\":\"bald\","
                + "\"double_label_share\":0.0,\"stop_agreement\":0.97,\"cold_start\":\"kmeans++\",\"chains\":2,"
                + "\"draws\":12,\"reburn_in_steps\":40,\"temperature\":0.5}";
        JsonNode changed = ok(send("PUT", "/api/v1/pools/iris/settings", every), 200);
        assertEquals(Json.tree(every), changed, "every field as sent, in the same names");
        assertEquals(Json.tree(every), ok(send("GET", "/api/v1/pools/iris/settings", ""), 200));
        assertEquals(Json.tree(every), Json.tree(db.pools().require("iris").settingsJson()),
                "the stored document is the one the API shows");
        // What GET shows, sent back as it is, changes nothing.
        assertEquals(Json.tree(every), ok(send("PUT", "/api/v1/pools/iris/settings",
                send("GET", "/api/v1/pools/iris/settings", "").body()), 200));
        JsonNode history = ok(send("GET", "/api/v1/pools/iris/settings/history", ""), 200).get("changes");
        assertEquals(before, history.get(0).get("before"));
        assertEquals(Json.tree(every), history.get(0).get("after"));
        assertEquals(Json.tree(every), history.get(1).get("after"));
    }

    @Test
    void previewSuggestsRolesFromTheHeadOfAFile() throws Exception {
        // The head is cut in the middle of its fourth record, as a browser's slice of a file would be.
        String head = "record_id,width,colour,label\nr1,1.5,red,ok\nr2,2.5,blue,\nr3,0.5,red,fault\nr4,3.";
        JsonNode p = ok(send("POST", "/api/v1/previews?file_name=head.csv", head), 200);
        assertEquals(3, p.get("rows").size());
        assertEquals("record_id", p.at("/suggested/id").asText());
        assertEquals("label", p.at("/suggested/label").asText());
        assertEquals("[\"width\"]", p.at("/suggested/features").toString());
        assertEquals("[\"width\",\"colour\"]", p.at("/suggested/display").toString());
        assertTrue(p.at("/columns/1/numeric").asBoolean());
        assertFalse(p.at("/columns/2/numeric").asBoolean());
        HttpResponse<String> broken = send("POST", "/api/v1/previews?file_name=x.csv", "a,a\n1,2\n");
        assertEquals(400, broken.statusCode());
        assertTrue(broken.body().contains("'a'"), broken.body());
    }

    @Test
    void labelsAndRoundsArriveAsServerSentEvents() throws Exception {
        HttpResponse<InputStream> stream = http.send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:"
                + server.port() + "/api/v1/events?pool=iris")).header("Authorization", "Bearer " + tokens.get("p2")).build(),
                HttpResponse.BodyHandlers.ofInputStream());
        assertEquals(200, stream.statusCode());
        assertTrue(stream.headers().firstValue("content-type").orElse("").startsWith("text/event-stream"));
        BufferedReader events = new BufferedReader(new InputStreamReader(stream.body(), StandardCharsets.UTF_8));
        CompletableFuture<String> seen = CompletableFuture.supplyAsync(() -> {
            StringBuilder all = new StringBuilder();
            try {
                for (String line = events.readLine(); line != null; line = events.readLine()) {
                    all.append(line).append('\n');
                    // Rounds may end before the label (the server starts one by itself): wait for one after it.
                    int label = all.indexOf("event:label");
                    if (label >= 0 && all.indexOf("\"status\":\"published\"", label) >= 0) {
                        return all.toString();
                    }
                }
            } catch (java.io.IOException e) {
                throw new java.io.UncheckedIOException(e);
            }
            return all.toString();
        });
        JsonNode a = ok(as("p1", "POST", "/api/v1/pools/iris/queue/next", "{}"), 200);
        ok(as("p1", "POST", "/api/v1/pools/iris/labels", "{\"record\":\"" + a.at("/record/id").asText()
                + "\",\"label\":\"virginica\"}"), 201);
        ok(send("POST", "/api/v1/pools/iris/rounds", ""), 202);
        String text = seen.get(60, TimeUnit.SECONDS);
        assertTrue(text.contains("event:label"), text);
        assertTrue(text.contains("\"change\":\"added\""), text);
        assertTrue(text.contains("event:round"), text);
        assertTrue(text.contains("\"status\":\"running\""), text);
        assertEquals(400, send("GET", "/api/v1/events", "").statusCode());
    }
}
