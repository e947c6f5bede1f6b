package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.TestSupport;
import dev.dowser.json.Json;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Strategy;
import dev.dowser.store.PoolRow;
import dev.dowser.store.QueueEntry;
import dev.dowser.store.RoundStore;
import dev.dowser.team.Role;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.function.DoubleUnaryOperator;
import java.util.function.IntToDoubleFunction;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;

/**
 * The keep-labelling card in a real headless Chromium against the real server and H2 file
 * database, in three states. At the start: iris (Fisher 1936, as shipped by Debian's
 * python3-sklearn) without its labels, labelled through the desk's calls by a labeller who knows
 * the true class, rounds running by themselves; the card and the desk's line say it is too early
 * to tell. Midway and at a plateau: pools whose history of rounds is written to the store as the
 * server keeps it, with accuracy following a known learning curve, so that what the card must say
 * is known: labels still paying, then predictions settled.
 */
class KeepLabellingBrowserTest extends BrowserFixture {

    static final String LEAD = "lead";
    static final String PERSON = "labeller-a";

    String lead;
    String person;
    final HttpClient http = HttpClient.newHttpClient();

    @BeforeEach
    void start() {
        db = TestSupport.openDb(dir.resolve("db"));
        lead = TestSupport.tokenFor(db, LEAD, Role.ADMIN);
        person = TestSupport.tokenFor(db, PERSON, Role.LABELLER);
        browser = Browser.shared();
    }

    /** Starts the server once the test has put its pools in the store as it wants them found. */
    private void serve() {
        server = TestSupport.quickServer(db, dir, 1 << 24);
    }

    private JsonNode call(String token, String method, String path, String body) throws Exception {
        HttpRequest.Builder b = HttpRequest.newBuilder(URI.create(base() + "api/v1/" + path))
                .header("Authorization", "Bearer " + token).header("Content-Type", "application/json");
        HttpResponse<String> r = http.send(b.method(method, body == null ? HttpRequest.BodyPublishers.noBody()
                : HttpRequest.BodyPublishers.ofString(body)).build(), HttpResponse.BodyHandlers.ofString());
        assertTrue(r.statusCode() < 300, method + " " + path + ": " + r.statusCode() + " " + r.body());
        return Json.tree(r.body());
    }

    /** The overview of {@code pool} once its card reads something that {@code reads} accepts. */
    private String card(String pool, String what, java.util.function.Predicate<String> reads) {
        browser.driver.get(base() + "overview.html?pool=" + pool);
        return browser.await(d -> {
            String h = browser.byId("keep-headline").getText();
            return reads.test(h) ? h : null;
        }, what);
    }

    /** Iris is in class order, 50 each: the row gives the true class. */
    private static String truth(long row) {
        return row < 50 ? "setosa" : row < 100 ? "versicolor" : "virginica";
    }

    /** Labels the next {@code count} records the desk hands out, as the labeller who knows the true class. */
    private void label(int count) throws Exception {
        for (int n = 0; n < count; n++) {
            JsonNode offer = call(person, "POST", "pools/iris/queue/next", null);
            JsonNode record = offer.path("record");
            assertTrue(record.isObject(), "the desk handed out no record after " + n + " of " + count + ": " + offer);
            call(person, "POST", "pools/iris/labels", Json.write(Json.object().put("record", record.get("id").asText())
                    .put("label", truth(record.get("row").asLong()))));
        }
    }

    /** The newest round of the iris pool (null before any). */
    private JsonNode newestRound() throws Exception {
        return call(lead, "GET", "pools/iris/rounds?limit=1", null).path("rounds").path(0);
    }

    /** Waits until the newest round is round {@code round}, published, and learnt from {@code labels} labels. */
    private void published(int round, int labels) throws Exception {
        TestSupport.await(Duration.ofSeconds(120), () -> {
            JsonNode newest = newestRound();
            return newest.path("round").asInt() == round && "published".equals(newest.path("status").asText())
                    && newest.path("labels_at_start").asInt() == labels;
        }, "round " + round + " published from " + labels + " labels");
    }

    /**
     * Asks for a round and waits until that round, the one after the newest before asking, is
     * published having learnt from exactly {@code labels} labels. No label is given meanwhile and no
     * other round waits when it is asked for, so it starts next and reads them all.
     */
    private void roundAt(int labels) throws Exception {
        int before = newestRound().path("round").asInt();
        call(lead, "POST", "pools/iris/rounds", "{}");
        published(before + 1, labels);
    }

    @Test
    void atTheStartItIsTooEarlyToTell() throws Exception {
        TestSupport.importIrisWithoutLabels(db, dir);
        // Each round must learn from a known number of labels however slow the machine is. Rounds
        // start by themselves in three ways, and the set-up rules each out but the first:
        // - the server gives a pool with nothing served its first round as it starts (RoundWorkers.watch):
        //   that round is the test's first batch, from 0 labels; the test waits for it rather than asking
        //   for one (asking while it ran queued a second round that read however many labels the test had
        //   given by the time it started: 7 under load);
        // - every batch of new labels: the batch here is 100, above the 30 labels given;
        // - the low-water mark of the served batch (2 open places per labeller): a batch of 100 of iris's
        //   150 records keeps at least 70 open.
        // The watcher's later looks start a round only for a pool with nothing served, and never after a
        // round that served it while they looked (RoundWorker.requestIfStillQuiet). The settings are in
        // place before the server starts watching the pool, so not even its first batch is drawn with
        // the defaults.
        PoolRow iris = db.pools().require("iris");
        db.pools().updateSettings(iris.id(), new PoolSettings(100, PoolSettings.DEFAULT_SPOT_CHECK_SHARE,
                PoolSettings.DEFAULT_LEASE_MINUTES, Strategy.POWER, 0).toJson(), LEAD);
        serve();
        JsonNode settings = call(lead, "GET", "pools/iris/settings", null);
        assertEquals(100, settings.get("batch_size").asInt(), settings.toString());
        signIn(LEAD);
        String start = card("iris", "the card before any label", h -> h.startsWith("No model yet"));
        assertEquals("No model yet: the first labels teach it. Dowser can tell whether more labels pay after a few"
                + " rounds.", start);
        browser.screenshot("keep-1-start");
        // The server's first batch, then three rounds with a model, asked for after 10, 20 and 30 labels.
        published(1, 0);
        for (int labels = 10; labels <= 30; labels += 10) {
            label(10);
            roundAt(labels);
        }
        String early = card("iris", "the card after 30 labels", h -> h.startsWith("Too early"));
        assertEquals("Too early to tell: the last round learnt from 30 labels. After a few more rounds Dowser can say"
                + " whether labels are still paying.", early);
        assertEquals("early", call(lead, "GET", "pools/iris/advice", null).get("state").asText());
        String facts = browser.byId("accuracy-facts").getText();
        assertTrue(facts.contains("From every picked record, weighted by how likely it was to be picked:"), facts);
        assertTrue(facts.contains("From spot checks (drawn at random):"), facts);
        assertTrue(browser.byId("keep-details").getText().contains("Agreement of"), browser.byId("keep-details").getText());
        browser.screenshot("keep-2-early");
        // Each round's own estimate names the labels its model learnt from: the rounds after 10 and
        // 20 labels have had picks labelled since; the newest has not yet.
        JsonNode accuracy = call(lead, "GET", "pools/iris/accuracy", null);
        List<Integer> learnt = new ArrayList<>();
        accuracy.get("rounds").forEach(r -> learnt.add(r.get("model_labels").asInt()));
        assertEquals(List.of(10, 20), learnt, accuracy.toString());
        // And no other round ran: none started by itself with its batch still full.
        JsonNode rounds = call(lead, "GET", "pools/iris/rounds", null);
        List<Integer> atStart = new ArrayList<>();
        rounds.get("rounds").forEach(r -> atStart.add(r.get("labels_at_start").asInt()));
        assertEquals(List.of(30, 20, 10, 0), atStart, rounds.toString());
        // The desk says the same in one line.
        browser.driver.get(base() + "desk.html?pool=iris");
        // The line names the labels of the last round, so it cannot be read as a count that lags the
        // progress line's labels of this session beside it.
        browser.await(d -> browser.byId("keep-line").getText().startsWith(
                "Too early to tell: the last round learnt from 30 labels."), "the desk's line");
        browser.screenshot("keep-3-desk");
    }

    /**
     * In a typiclust-power pool's typical phase the picks are typical records taken outright, so the
     * accuracy card cannot weight them; it used to link "Pick by power sampling", which the strategy
     * turns to by itself. It now says so instead.
     */
    @Test
    void aTypicalPhaseDoesNotAskForPowerSampling() throws Exception {
        TestSupport.importIrisWithoutLabels(db, dir);
        PoolRow iris = db.pools().require("iris");
        db.pools().updateSettings(iris.id(), new PoolSettings(10, PoolSettings.DEFAULT_SPOT_CHECK_SHARE,
                PoolSettings.DEFAULT_LEASE_MINUTES, Strategy.TYPICLUST_POWER, 0).toJson(), LEAD);
        serve();
        published(1, 0);
        label(10);
        // Rounds also start by themselves (the low-water mark may start one before the tenth label): ask for one.
        call(lead, "POST", "pools/iris/rounds", "{}");
        TestSupport.await(Duration.ofSeconds(120), () -> newestRound().path("labels_at_start").asInt() >= 10
                && "published".equals(newestRound().path("status").asText()), "a round from 10 labels");
        label(10);
        // Rounds also start by themselves (the low-water mark may start one before the tenth label): ask for one.
        call(lead, "POST", "pools/iris/rounds", "{}");
        TestSupport.await(Duration.ofSeconds(120), () -> newestRound().path("labels_at_start").asInt() >= 20
                && "published".equals(newestRound().path("status").asText()), "a round from 20 labels");
        assertEquals(0, call(lead, "GET", "pools/iris/accuracy", null).at("/picked/labels").asInt(),
                "the typical phase's picks are not weighted");
        signIn(PERSON);
        browser.driver.get(base() + "overview.html?pool=iris");
        String facts = browser.await(d -> {
            String f = browser.byId("accuracy-facts").getText();
            return f.contains("Picked records cannot tell") ? f : null;
        }, "the accuracy card");
        browser.screenshot("keep-typical-phase");
        assertFalse(facts.contains("Pick by power sampling"), facts);
        assertTrue(facts.contains("Picked records cannot tell yet: while labels are few, this pool's strategy"
                + " (typiclust-power) takes the most typical records outright"), facts);
    }

    @Test
    void midwayLabelsPayAndAtAPlateauPredictionsHaveSettled() throws Exception {
        // Accuracy 0.98 - 2.5 n^-0.6 over 12 rounds of 20 labels (20 to 240): from 240 to 340
        // labels the curve gains 100 * 2.5 (240^-0.6 - 340^-0.6) = 1.8 points.
        String good = "{\"rhatMax\":1.08,\"essBulkMin\":30,\"essTailMin\":24,\"divergences\":0}";
        history("midway", 12, n -> 0.98 - 2.5 * Math.pow(n, -0.6), r -> 0.6 + 0.03 * r, good);
        serve();
        signIn(LEAD);
        String midway = card("midway", "the card midway", h -> h.startsWith("Labels are still paying"));
        assertTrue(midway.matches("Labels are still paying: about \\+[0-9.]+ points per 100 labels\\."), midway);
        String details = browser.byId("keep-details").getText();
        assertTrue(details.contains("Projected accuracy from the learning curve:"), details);
        assertTrue(browser.byId("chain-summary").getText().contains("nothing to do"),
                browser.byId("chain-summary").getText());
        browser.screenshot("keep-4-midway");
        browser.driver.executeScript("arguments[0].scrollIntoView()", browser.byId("accuracy-title"));
        browser.screenshot("keep-4-midway-accuracy");

        // 40 rounds to 800 labels on a curve that has levelled off, the last three rounds'
        // predictions agreeing at 0.998 (above the default 0.995), and chains whose draws lean on few independent ones; the
        // pool samples with its own 4 chains and 64 draws.
        String few = "{\"rhatMax\":1.6,\"essBulkMin\":5,\"essTailMin\":4,\"divergences\":0}";
        history("plateau", 40, n -> 0.95 - 0.5 * Math.pow(n, -1.2), r -> r >= 38 ? 0.998 : 0.95, few);
        call(lead, "PUT", "pools/plateau/settings", "{\"chains\":4,\"draws\":64,\"reburn_in_steps\":300}");
        String plateau = card("plateau", "the card at a plateau", h -> h.startsWith("Predictions have settled"));
        assertTrue(plateau.matches("Predictions have settled: they barely changed over the last 3 rounds; accuracy"
                + " 0\\.9\\d \\(0\\.\\d\\d-\\d\\.\\d\\d\\)\\. More labels are unlikely to change it much\\."), plateau);
        String advice = browser.byId("advice").getText();
        assertTrue(advice.contains("Set Draws kept to 128"), advice);
        assertTrue(advice.contains("different good explanation"), advice);
        browser.screenshot("keep-5-plateau");
        browser.driver.executeScript("arguments[0].scrollIntoView()", browser.byId("health-title"));
        browser.screenshot("keep-6-plateau-chains");
        // The advice's link fills in the setting it names, for the admin to save.
        browser.driver.findElement(By.linkText("Set Draws kept to 128")).click();
        assertEquals("128", browser.byId("setting-draws").getAttribute("value"));
        browser.byId("settings-save").click();
        browser.await(d -> browser.byId("settings-message").getText().startsWith("Saved"), "the settings saved");
        assertEquals(128, call(lead, "GET", "pools/plateau/settings", null).get("draws").asInt());
        browser.await(d -> browser.byId("advice").getText().contains("the next round uses them"),
                "the advice after the change");
        browser.driver.executeScript("arguments[0].scrollIntoView()", browser.byId("health-title"));
        browser.screenshot("keep-7-plateau-draws-raised");
    }

    /**
     * A pool of 3,000 records with {@code rounds} rounds written as the server keeps them: round r's
     * model learnt from 20 r labels, picked 20 records uniformly (the last two spot checks), and
     * got round(20 accuracy(20 r)) of them right, spread over its picks; its stop-set agreement with the round before is
     * {@code agreement(r)}.
     */
    private void history(String name, int rounds, DoubleUnaryOperator accuracy, IntToDoubleFunction agreement,
                         String health) {
        StringBuilder csv = new StringBuilder("id,x\n");
        for (int i = 0; i < 3000; i++) {
            csv.append("r").append(i).append(',').append(i % 97).append('\n');
        }
        TestSupport.importText(db, name, csv.toString(), TestSupport.csv(name).withId("id")
                .withClasses(List.of("a", "b")));
        PoolRow pool = db.pools().require(name);
        long row = 0;
        int picks = 20;
        for (int r = 1; r <= rounds; r++) {
            long labels = (long) picks * r;
            long candidates = 3000 - row;
            db.rounds().start(pool.id(), r, labels, new RoundStore.Inputs(r, "{\"chains\":4,\"draws\":64}", null, 0,
                    null));
            db.rounds().finish(pool.id(), r, "mala", "a history written by the test", health);
            db.rounds().settled(pool.id(), r, new RoundStore.Settled(candidates, r == 1 ? Double.NaN
                    : agreement.applyAsDouble(r), 2000, 100.0 / r, 10.0 / r));
            long right = Math.round(picks * accuracy.applyAsDouble(labels));
            List<QueueEntry> queue = new ArrayList<>();
            for (int m = 1; m <= picks; m++) {
                queue.add(new QueueEntry(r, m - 1, row + m - 1, 0.1, m > picks - 2, "{\"mean\":[0.9,0.1],\"sd\":[0,0]}",
                        null, null, 1, 1.0 / (candidates + 1 - m), m));
            }
            db.queues().publish(pool.id(), r, queue);
            for (int m = 1; m <= picks; m++) {
                // (7 m + 3 r) mod 20 runs over 0..19 as m does: the wrong picks fall in a different place each round.
                boolean wrong = (7 * m + 3 * r) % picks < picks - right;
                db.labels().add(pool.id(), row++, wrong ? "b" : "a", "history", null);
            }
        }
    }
}
