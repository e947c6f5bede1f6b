package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.TestSupport;
import dev.dowser.json.Json;
import dev.dowser.store.Database;
import dev.dowser.team.Role;
import java.io.IOException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Map;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The JSON API on a real Undertow server on a loopback port, over the real H2 file database. */
class ApiTest {

    @TempDir
    Path dir;
    Database db;
    WebServer server;
    String admin;
    final HttpClient http = HttpClient.newHttpClient();

    @BeforeEach
    void start() {
        db = TestSupport.openDb(dir.resolve("db"));
        server = TestSupport.quickServer(db, dir, 4_096);
        admin = TestSupport.tokenFor(db, "ana", Role.ADMIN);
    }

    @AfterEach
    void stop() {
        server.close();
        db.close();
    }

    /** Sends as the admin ana, through her API token. */
    private HttpResponse<String> send(HttpRequest.Builder b) throws IOException, InterruptedException {
        return http.send(b.header("Authorization", "Bearer " + admin).build(), HttpResponse.BodyHandlers.ofString());
    }

    private HttpRequest.Builder at(String path) {
        return HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + server.port() + path));
    }

    private HttpResponse<String> upload(String query, String body) throws IOException, InterruptedException {
        return send(at("/api/v1/imports?" + query).POST(HttpRequest.BodyPublishers.ofString(body)));
    }

    @Test
    void importLabelAndExportThroughTheApi() throws Exception {
        HttpResponse<String> r = upload("pool=pumps&file_name=p.csv&id=id&label=state&wait=true",
                "id,flow,state\nu1,1.5,ok\nu2,2.5,\nu3,0.5,fault\n");
        assertEquals(201, r.statusCode(), r.body());
        assertEquals("done", Json.tree(r.body()).get("state").asText());

        JsonNode pools = Json.tree(send(at("/api/v1/pools")).body()).get("pools");
        assertEquals("pumps", pools.get(0).get("name").asText());
        assertEquals(3, pools.get(0).get("records").asInt());
        assertEquals(2, pools.get(0).get("labelled").asInt());

        JsonNode pool = Json.tree(send(at("/api/v1/pools/pumps")).body());
        assertEquals("fault", pool.get("classes").get(0).get("name").asText());
        assertEquals("1", pool.get("classes").get(0).get("key").asText());

        JsonNode page = Json.tree(send(at("/api/v1/pools/pumps/records?offset=1&limit=1")).body());
        assertEquals("u2", page.get("records").get(0).get("id").asText());
        assertEquals("2.5", page.get("records").get(0).get("fields").get("flow").asText());

        HttpResponse<String> labelled = send(at("/api/v1/pools/pumps/labels").POST(HttpRequest.BodyPublishers
                .ofString("{\"record\":\"u2\",\"label\":\"ok\",\"note\":\"by ear\"}")));
        assertEquals(201, labelled.statusCode(), labelled.body());
        assertEquals("ana", Json.tree(labelled.body()).get("labelled_by").asText());

        HttpResponse<String> csv = send(at("/api/v1/pools/pumps/export?format=csv"));
        assertEquals(200, csv.statusCode());
        assertTrue(csv.headers().firstValue("content-disposition").orElse("").contains("pumps-labels.csv"));
        assertEquals(4, csv.body().split("\r\n").length, csv.body());
        assertTrue(csv.body().contains("u2,2.5,ok,single,ana,"), csv.body());
        assertTrue(csv.body().contains(",by ear,\"{\"\"ana\"\":\"\"ok\"\"}\",,,,\r\n"), csv.body());
    }

    /**
     * Issue 11: an export is never cached, and a display field a spreadsheet would run as a formula
     * (OWASP, "CSV Injection") is written with a ' in front unless the caller asks to keep it.
     */
    @Test
    void exportsAreNotCachedAndFormulasAreEscapedUnlessKept() throws Exception {
        HttpResponse<String> r = upload("pool=notes&file_name=n.csv&id=id&label=state&display=remark&features=flow&wait=true",
                "id,remark,flow,state\nn1,\"=HYPERLINK(\"\"http://x.example\"\")\",1.5,ok\nn2,-4.5,2.5,fault\n");
        assertEquals(201, r.statusCode(), r.body());
        HttpResponse<String> csv = send(at("/api/v1/pools/notes/export?format=csv"));
        assertEquals(200, csv.statusCode(), csv.body());
        assertEquals("no-store", csv.headers().firstValue("cache-control").orElse(""));
        assertTrue(csv.body().contains("\r\nn1,\"'=HYPERLINK(\"\"http://x.example\"\")\",ok,"), csv.body());
        assertTrue(csv.body().contains("\r\nn2,-4.5,fault,"), "a plain number stays as it is: " + csv.body());
        HttpResponse<String> kept = send(at("/api/v1/pools/notes/export?format=csv&formulas=keep"));
        assertEquals("no-store", kept.headers().firstValue("cache-control").orElse(""));
        assertTrue(kept.body().contains("\r\nn1,\"=HYPERLINK(\"\"http://x.example\"\")\",ok,"), kept.body());
        HttpResponse<String> jsonl = send(at("/api/v1/pools/notes/export?format=jsonl"));
        assertEquals("no-store", jsonl.headers().firstValue("cache-control").orElse(""));
        assertTrue(jsonl.body().contains("\"remark\":\"=HYPERLINK(\\\"http://x.example\\\")\""), jsonl.body());
        HttpResponse<String> wrong = send(at("/api/v1/pools/notes/export?format=csv&formulas=strip"));
        assertEquals(400, wrong.statusCode());
        assertEquals("unknown formulas choice 'strip': use escape or keep", Json.tree(wrong.body()).get("error").asText());
    }

    /**
     * Issue 11: tokens kept working after an admin set someone's password, and no admin could see or
     * revoke another person's token. Walked here as a script would, through the API only.
     */
    @Test
    void adminsListAndRevokeAnyonesTokensAndANewPasswordRevokesTheRest() throws Exception {
        String first = TestSupport.tokenFor(db, "cy", Role.LABELLER);
        HttpResponse<String> made = http.send(at("/api/v1/tokens").header("Authorization", "Bearer " + first)
                .POST(HttpRequest.BodyPublishers.ofString("{\"name\":\"nightly\"}")).build(),
                HttpResponse.BodyHandlers.ofString());
        assertEquals(201, made.statusCode(), made.body());
        String second = Json.tree(made.body()).get("token").asText();

        JsonNode listed = Json.tree(send(at("/api/v1/users/cy/tokens")).body());
        assertEquals("cy", listed.get("name").asText());
        assertEquals(java.util.List.of("test", "nightly"), listed.get("tokens").findValuesAsText("name"));
        long nightly = listed.get("tokens").get(1).get("id").asLong();
        HttpResponse<String> revoked = send(at("/api/v1/users/cy/tokens/" + nightly).DELETE());
        assertEquals(200, revoked.statusCode(), revoked.body());
        assertEquals("{\"revoked\":" + nightly + ",\"name\":\"cy\"}", revoked.body());
        assertEquals(401, as(second, "/api/v1/pools").statusCode(), "a revoked token stops at once");
        assertEquals(200, as(first, "/api/v1/pools").statusCode(), "the other token stays");
        assertEquals(java.util.List.of("test"), Json.tree(send(at("/api/v1/users/cy/tokens")).body()).get("tokens")
                .findValuesAsText("name"), "a revoked token is no longer listed");
        HttpResponse<String> again = send(at("/api/v1/users/cy/tokens/" + nightly).DELETE());
        assertEquals(404, again.statusCode());
        assertEquals("the account 'cy' has no live token with id " + nightly, Json.tree(again.body()).get("error").asText());
        HttpResponse<String> notHers = send(at("/api/v1/users/ana/tokens/"
                + Json.tree(send(at("/api/v1/users/cy/tokens")).body()).at("/tokens/0/id").asLong()).DELETE());
        assertEquals(404, notHers.statusCode(), "a token is revoked under its own account only");

        HttpResponse<String> reset = send(at("/api/v1/users/cy").PUT(HttpRequest.BodyPublishers.ofString(
                "{\"password\":\"a new one for cy\"}")));
        assertEquals(200, reset.statusCode(), reset.body());
        assertEquals(401, as(first, "/api/v1/pools").statusCode(), "a new password revokes every token of the account");
        assertEquals(0, Json.tree(send(at("/api/v1/users/cy/tokens")).body()).get("tokens").size());
        JsonNode users = Json.tree(send(at("/api/v1/users")).body()).get("users");
        for (JsonNode u : users) {
            if (u.get("name").asText().equals("cy")) {
                assertEquals(0, u.get("live_tokens").asInt(), u.toString());
            }
        }
    }

    private HttpResponse<String> as(String token, String path) throws IOException, InterruptedException {
        return http.send(at(path).header("Authorization", "Bearer " + token).build(), HttpResponse.BodyHandlers.ofString());
    }

    /** Issue 14: the values files write for "missing" are missing through the API too, under import's name. */
    @Test
    void missingTokensAreTakenAsImportTakesThem() throws Exception {
        String file = "id,flow,state\nu1,1.5,ok\nu2,NA,fault\nu3,?,ok\nu4,2.5,fault\n";
        HttpResponse<String> plain = upload("pool=gauges&file_name=g.csv&id=id&label=state&wait=true", file);
        assertEquals(201, plain.statusCode(), plain.body());
        assertEquals(4, Json.tree(plain.body()).at("/result/records").asInt(), plain.body());

        HttpResponse<String> none = upload("pool=gauges2&file_name=g.csv&id=id&label=state&missing=&wait=true", file);
        assertEquals(400, none.statusCode(), none.body());
        assertTrue(Json.tree(none.body()).get("error").asText().startsWith(
                "line 3, column 'flow': expected a number, got 'NA'"), none.body());
        HttpResponse<String> onlyNa = upload("pool=gauges3&file_name=g.csv&id=id&label=state&missing=NA&wait=true", file);
        assertEquals(400, onlyNa.statusCode(), onlyNa.body());
        assertTrue(Json.tree(onlyNa.body()).get("error").asText().startsWith(
                "line 4, column 'flow': expected a number, got '?'"), onlyNa.body());
        HttpResponse<String> both = upload("pool=gauges4&file_name=g.csv&id=id&label=state&missing=NA,%3F&wait=true", file);
        assertEquals(201, both.statusCode(), both.body());
    }

    @Test
    void errorsAreJsonWithAMessageAndLeaveDataAlone() throws Exception {
        upload("pool=kept&classes=yes,no&wait=true", "a\n1\n");
        Map<String, Long> before = TestSupport.tableCounts(dir.resolve("db"));

        HttpResponse<String> noClasses = upload("pool=p&wait=true", "a,b\n1,2\n");
        assertEquals(400, noClasses.statusCode());
        assertEquals("a pool needs classes for people to choose from: add classes=a,b,c to the call, or"
                + " label=COLUMN naming the column that holds labels already given",
                Json.tree(noClasses.body()).get("error").asText());
        HttpResponse<String> emptyLabels = upload("pool=p&label=b&wait=true", "a,b\n1,\n2,\n");
        assertEquals(400, emptyLabels.statusCode());
        assertEquals("the label column 'b' holds no labels, so the pool would have no classes to choose from;"
                + " name the classes as well", Json.tree(emptyLabels.body()).get("error").asText());

        HttpResponse<String> bad = upload("pool=p&classes=yes,no&wait=true", "a,b\n1,2\n3\n");
        assertEquals(400, bad.statusCode());
        assertEquals("line 3: the record has 1 field where the header has 2; quote fields that contain commas",
                Json.tree(bad.body()).get("error").asText());

        HttpResponse<String> big = upload("pool=p&classes=yes,no&wait=true", "a\n" + "1\n".repeat(5_000));
        assertEquals(413, big.statusCode());
        assertEquals("the upload is 9.8 KiB, larger than the limit of 4 KiB (raise it with dowser serve"
                + " --max-upload-mib); nothing was imported", Json.tree(big.body()).get("error").asText());

        HttpResponse<String> missing = send(at("/api/v1/pools/nope"));
        assertEquals(404, missing.statusCode());
        assertEquals("no pool named 'nope'", Json.tree(missing.body()).get("error").asText());

        HttpResponse<String> wrongLabel = send(at("/api/v1/pools/kept/labels").POST(HttpRequest.BodyPublishers
                .ofString("{\"record\":\"2\",\"label\":\"zzz\"}")));
        assertEquals(400, wrongLabel.statusCode());

        HttpResponse<String> hostile = send(at("/api/v1/pools/kept/labels").POST(HttpRequest.BodyPublishers
                .ofString("{\"record\":")));
        assertEquals(400, hostile.statusCode());
        assertTrue(Json.tree(hostile.body()).get("error").asText().startsWith("a label request is not valid JSON"),
                hostile.body());

        assertEquals(before, TestSupport.tableCounts(dir.resolve("db")));
    }

    @Test
    void importProgressCanBeFollowed() throws Exception {
        HttpResponse<String> r = upload("pool=later&classes=yes,no", "a\n1\n2\n");
        assertEquals(202, r.statusCode());
        long id = Json.tree(r.body()).get("id").asLong();
        TestSupport.await(Duration.ofSeconds(30), () -> Json.tree(send(at("/api/v1/imports/" + id)).body())
                .get("state").asText().equals("done"), "the import to finish");
    }

    /** Iris (Fisher 1936, as shipped by Debian's python3-sklearn) without its labels: a first round, a lease, a label. */
    @Test
    void aRoundIsServedOneRecordAtATime() throws Exception {
        TestSupport.OpenDataset iris = TestSupport.openDataset("iris", dir);
        HttpResponse<String> imported = send(at("/api/v1/imports?pool=iris&file_name=iris.csv&features=f0,f1,f2,f3"
                + "&classes=setosa,versicolor,virginica&wait=true").POST(HttpRequest.BodyPublishers.ofFile(iris.csv())));
        assertEquals(201, imported.statusCode(), imported.body());
        assertEquals(202, send(at("/api/v1/pools/iris/rounds").POST(HttpRequest.BodyPublishers.noBody())).statusCode());
        TestSupport.await(Duration.ofSeconds(60), () -> {
            JsonNode r = Json.tree(send(at("/api/v1/pools/iris/rounds")).body());
            return r.has("served_round") && r.get("rounds").get(0).get("status").asText().equals("published");
        }, "the first round to be published");
        JsonNode rounds = Json.tree(send(at("/api/v1/pools/iris/rounds")).body());
        assertEquals(1, rounds.get("served_round").asInt(), rounds.toString());
        assertEquals("published", rounds.get("rounds").get(0).get("status").asText());

        HttpResponse<String> next = send(at("/api/v1/pools/iris/queue/next").POST(HttpRequest.BodyPublishers.noBody()));
        assertEquals(200, next.statusCode(), next.body());
        JsonNode lease = Json.tree(next.body());
        String id = lease.get("record").get("id").asText();
        // Another person asking at the same time gets another record.
        String ben = TestSupport.tokenFor(db, "ben", Role.LABELLER);
        JsonNode other = Json.tree(http.send(at("/api/v1/pools/iris/queue/next").header("Authorization", "Bearer " + ben)
                .POST(HttpRequest.BodyPublishers.noBody()).build(), HttpResponse.BodyHandlers.ofString()).body());
        assertTrue(!id.equals(other.get("record").get("id").asText()), "two people got record " + id);
        HttpResponse<String> labelled = send(at("/api/v1/pools/iris/labels").POST(HttpRequest.BodyPublishers
                .ofString("{\"record\":\"" + id + "\",\"label\":\"setosa\"}")));
        assertEquals(201, labelled.statusCode(), labelled.body());
        assertEquals(9, Json.tree(send(at("/api/v1/pools/iris/rounds")).body()).get("labels_to_next_round").asInt());
    }

    @Test
    void pagesAreServedWithCachingHeaders() throws Exception {
        HttpResponse<String> page = send(at("/"));
        assertEquals(200, page.statusCode());
        assertEquals("no-cache", page.headers().firstValue("cache-control").orElse(""));
        assertEquals("nosniff", page.headers().firstValue("x-content-type-options").orElse(""));
    }
}
