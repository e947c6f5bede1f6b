package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.TestSupport;
import dev.dowser.json.Json;
import dev.dowser.sampler.KernelChoice;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.store.RoundStatus;
import dev.dowser.team.Role;
import java.io.BufferedReader;
import java.io.StringReader;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.Keys;
import org.openqa.selenium.WebElement;
import org.openqa.selenium.interactions.Actions;
import org.openqa.selenium.support.ui.Select;

/**
 * The pages in a real headless Chromium against the real server and H2 file database. The pool is
 * the UCI wine data (Forina et al., as shipped by Debian's python3-sklearn 1.2.1) with most labels
 * removed; its known classes play the labeller, who answers by keyboard.
 */
class PagesBrowserTest extends BrowserFixture {

    static final String PERSON = "labeller-a";
    static final String LEAD = "lead";
    static final int KNOWN_PER_CLASS = 2;

    /** The admin's API token, for calls the test makes around the browser. */
    String lead;
    final HttpClient http = HttpClient.newHttpClient();

    @BeforeEach
    void start() {
        db = TestSupport.openDb(dir.resolve("db"));
        // A small network and short chains: rounds take well under a second, as the desk expects.
        SamplerConfig quick = TestSupport.quickSampler();
        server = WebServer.start(db, new WebConfig("127.0.0.1", 0, 1 << 24, dir.resolve("uploads")), quick,
                TestSupport.FAST_TEAM);
        lead = TestSupport.tokenFor(db, LEAD, Role.ADMIN);
        TestSupport.tokenFor(db, PERSON, Role.LABELLER);
        TestSupport.tokenFor(db, "labeller-b", Role.LABELLER);
        browser = Browser.shared();
    }

    /** The wine data with only the first few records of each class labelled; returns each line's true class. */
    private Map<Long, String> partlyLabelledWine(Path out) throws Exception {
        TestSupport.OpenDataset wine = TestSupport.openDataset("wine", dir);
        List<String> lines = Files.readAllLines(wine.csv());
        Map<Long, String> truth = new HashMap<>();
        Map<String, Integer> kept = new HashMap<>();
        List<String> written = new ArrayList<>();
        written.add(lines.get(0));
        for (int i = 1; i < lines.size(); i++) {
            String line = lines.get(i);
            String label = line.substring(line.lastIndexOf(',') + 1);
            truth.put((long) i + 1, label);
            boolean keep = kept.merge(label, 1, Integer::sum) <= KNOWN_PER_CLASS;
            written.add(keep ? line : line.substring(0, line.lastIndexOf(',') + 1));
        }
        Files.write(out, written);
        return truth;
    }

    /** Signs out through the page when someone is signed in, then signs {@code name} in. */
    @Override
    void signIn(String name) {
        if (browser.driver.findElements(By.id("sign-out")).isEmpty()) {
            super.signIn(name);
            return;
        }
        browser.byId("sign-out").click();
        browser.await(d -> d.getCurrentUrl().contains("login.html"), "signing out");
        signInHere(name);
    }

    private HttpRequest.Builder asLead(String path) {
        return HttpRequest.newBuilder(URI.create(base() + path)).header("Authorization", "Bearer " + lead);
    }

    private void press(CharSequence key) {
        new Actions(browser.driver).sendKeys(key).perform();
    }

    @Test
    void aPoolFromUploadToExportByKeyboard() throws Exception {
        Path file = dir.resolve("wine-part.csv");
        Map<Long, String> truth = partlyLabelledWine(file);
        List<String> classes = List.of("class_0", "class_1", "class_2");

        // Pools page, as the admin: upload, then the mapping step with its suggested roles.
        browser.driver.get(base());
        browser.await(d -> d.getCurrentUrl().contains("login.html"), "the sign-in page first");
        signIn(LEAD);
        browser.driver.get(base());
        browser.await(d -> browser.byId("pools-empty").isDisplayed(), "the empty pool list");
        browser.byId("import-form").findElement(By.name("pool")).sendKeys("wine-part");
        browser.byId("import-form").findElement(By.name("file")).sendKeys(file.toAbsolutePath().toString());
        browser.byId("preview-button").click();
        browser.await(d -> browser.byId("mapping").isDisplayed(), "the mapping step");
        List<WebElement> roles = browser.byId("mapping-table").findElements(By.tagName("select"));
        assertEquals(14, roles.size(), "one role per column: 13 features and the label");
        assertEquals("label", new Select(roles.get(13)).getFirstSelectedOption().getAttribute("value"));
        assertEquals("feature-shown", new Select(roles.get(0)).getFirstSelectedOption().getAttribute("value"));
        browser.screenshot("1-pools-mapping");
        browser.byId("import-button").click();
        browser.await(d -> !d.findElements(By.id("new-pool-link")).isEmpty(), "the import to finish");
        assertTrue(browser.byId("import-message").getText().contains("178 records"), browser.byId("import-message").getText());
        browser.screenshot("2-pools-imported");

        // Overview: the first batch arrives without anyone asking for a round.
        browser.byId("new-pool-link").click();
        browser.await(d -> browser.byId("pool-facts").getText().contains("178 records"), "the overview");
        browser.await(d -> !browser.byId("queue").findElements(By.cssSelector("tbody tr")).isEmpty(), "the first queue");
        browser.screenshot("3-overview-first-round");

        // Desk, as a labeller: 20 labels by keyboard only.
        signIn(PERSON);
        browser.driver.get(base() + "desk.html?pool=wine-part");
        browser.await(d -> !cardId().isEmpty(), "the first record on the desk");
        browser.driver.executeScript("window.__sameDocument = true;");
        String firstProgress = browser.byId("progress").getText();
        assertTrue(firstProgress.contains("round 1"), firstProgress);
        browser.screenshot("4-desk");

        Map<String, String> given = new LinkedHashMap<>();
        String previous = "";
        for (int i = 0; i < 20; i++) {
            String shown = previous;
            String id = browser.await(d -> {
                String now = cardId();
                return now.isEmpty() || now.equals(shown) ? null : now;
            }, "record " + (i + 1) + " on the desk");
            assertFalse(given.containsKey(id), "record " + id + " was handed out twice");
            String answer = truth.get(Long.parseLong(id));
            press(String.valueOf(classes.indexOf(answer) + 1));
            given.put(id, answer);
            previous = id;
        }
        // Rounds started as the batches ran low (at least two by now); the page heard without a reload.
        browser.await(d -> servedRoundShown() >= 3, "round 3 or later announced on the desk");
        assertEquals(Boolean.TRUE, browser.driver.executeScript("return window.__sameDocument === true;"));
        assertTrue(browser.byId("progress").getText().contains("20 labelled this session"), browser.byId("progress").getText());

        // Undo is a stack: two presses take back the last two labels, newest first; both records are
        // labelled again, differently, the older first, then the newer one comes back by itself.
        List<String> order = new ArrayList<>(given.keySet());
        String last = order.get(order.size() - 1);
        String before = order.get(order.size() - 2);
        browser.await(d -> !cardId().isEmpty() && !cardId().equals(last), "the record after the last");
        browser.await(d -> browser.byId("mine-list").getText().startsWith(last), "my last labels, newest first");
        press(Keys.BACK_SPACE);
        browser.await(d -> cardId().equals(last), "the taken-back record shown again");
        // The card and the message are written one after the other: wait for the message, as for the card.
        browser.await(d -> browser.byId("desk-message").getText().contains("Took back"), "the desk saying it took the label back");
        press(Keys.BACK_SPACE);
        browser.await(d -> cardId().equals(before), "the label before it taken back too");
        assertTrue(browser.byId("card-why").getText().startsWith("Taken back (your label was " + given.get(before)),
                browser.byId("card-why").getText());
        browser.screenshot("5-desk-after-undo");
        for (String id : List.of(before, last)) {
            browser.await(d -> cardId().equals(id), id + " to label again");
            String changed = classes.get((classes.indexOf(given.get(id)) + 1) % classes.size());
            press(String.valueOf(classes.indexOf(changed) + 1));
            given.put(id, changed);
        }
        browser.await(d -> !cardId().isEmpty() && !cardId().equals(last), "the desk moving on");
        browser.await(d -> browser.byId("mine-list").getText().startsWith(last + "\n" + given.get(last)),
                "the new labels listed: " + browser.byId("mine-list").getText());
        if (browser.byId("belief-toggle").isEnabled()) {
            press(".");
            browser.await(d -> browser.byId("belief").isDisplayed(), "the model's belief");
        }
        browser.screenshot("6-desk-belief");

        // Overview again, as the admin: rounds with their health, accuracy panel, queue.
        signIn(LEAD);
        browser.driver.get(base() + "overview.html?pool=wine-part");
        browser.await(d -> browser.byId("rounds").findElements(By.cssSelector("tbody tr:not(.round-note)")).size() >= 3, "three rounds listed");
        browser.await(d -> !browser.byId("health").getText().isEmpty(), "chain health");
        // A round's note shows only where it says something the older round's did not (numbers aside):
        // the kernel's sentence is not repeated row after row.
        List<String> notes = new ArrayList<>();
        for (WebElement row : browser.byId("rounds").findElements(By.cssSelector("tbody tr"))) {
            if (row.getAttribute("class").contains("round-note")) {
                notes.set(notes.size() - 1, row.getText().replaceAll("[0-9][0-9.,]*", "#"));
            } else {
                notes.add("");
            }
        }
        for (int i = 1; i < notes.size(); i++) {
            assertTrue(notes.get(i).isEmpty() || !notes.get(i).equals(notes.get(i - 1)), "a note repeated: " + notes);
        }
        browser.screenshot("7-overview");

        // Export from the overview's link: exactly the labels given, the undone one as relabelled.
        String href = browser.byId("export-jsonl").getAttribute("href");
        HttpResponse<String> export = http.send(HttpRequest.newBuilder(URI.create(href))
                        .header("Authorization", "Bearer " + lead).build(), HttpResponse.BodyHandlers.ofString());
        assertEquals(200, export.statusCode());
        Map<String, String> exported = new LinkedHashMap<>();
        try (BufferedReader r = new BufferedReader(new StringReader(export.body()))) {
            for (String line = r.readLine(); line != null; line = r.readLine()) {
                JsonNode n = Json.tree(line);
                if (PERSON.equals(n.path("labelled_by").asText())) {
                    exported.put(n.get("id").asText(), n.get("label").asText());
                }
            }
        }
        assertEquals(given, exported);
    }

    @Test
    void theMappingStepSuggestsTheIdWarnsOfAFullyLabelledFileAndSetsManyColumnsAtOnce() throws Exception {
        StringBuilder csv = new StringBuilder("row_id,px0,px1,px2,px3,px4,px5,site,target\n");
        for (int i = 0; i < 30; i++) {
            csv.append(1000 + i * 7).append(',');
            for (int p = 0; p < 6; p++) {
                csv.append((i * 31 + p * 17) % 16).append(',');
            }
            csv.append(i % 2 == 0 ? "north" : "south").append(',').append(i % 3 == 0 ? "wet" : "dry").append('\n');
        }
        Path file = dir.resolve("field-scans.csv");
        Files.writeString(file, csv);
        signIn(LEAD);
        browser.driver.get(base());
        browser.byId("import-form").findElement(By.name("pool")).sendKeys("scans");
        browser.byId("import-form").findElement(By.name("file")).sendKeys(file.toAbsolutePath().toString());
        browser.byId("preview-button").click();
        browser.await(d -> browser.byId("mapping").isDisplayed(), "the mapping step");
        Select id = new Select(browser.byId("mapping").findElement(By.name("role-0")));
        assertEquals("id", id.getFirstSelectedOption().getAttribute("value"), "row_id suggested as the id");
        assertEquals("label", new Select(browser.byId("mapping").findElement(By.name("role-8")))
                .getFirstSelectedOption().getAttribute("value"));
        String warning = browser.byId("mapping-warning").getText();
        assertTrue(warning.contains("Every one of the first 30 records already has a label in 'target'"), warning);

        // Six pixel columns set at once by a name pattern.
        WebElement mapping = browser.byId("mapping");
        new Select(mapping.findElement(By.name("bulk_role"))).selectByValue("feature");
        new Select(mapping.findElement(By.name("bulk_which"))).selectByValue("pattern");
        mapping.findElement(By.name("bulk_pattern")).sendKeys("px*");
        browser.await(d -> browser.byId("bulk-count").getText().equals("6 columns"), "six columns named by the pattern");
        browser.byId("bulk-apply").click();
        for (int c = 1; c <= 6; c++) {
            assertEquals("feature", new Select(mapping.findElement(By.name("role-" + c))).getFirstSelectedOption()
                    .getAttribute("value"), "column px" + (c - 1));
        }
        assertEquals("shown", new Select(mapping.findElement(By.name("role-7"))).getFirstSelectedOption()
                .getAttribute("value"), "site is text: shown, not a feature");
        browser.screenshot("1b-mapping-warning");

        browser.byId("import-button").click();
        browser.await(d -> browser.byId("import-message").getText().contains("tick \"Import these labels anyway\""),
                "the import held back until the labels are accepted");
        // Without the label column, the classes are asked for.
        new Select(mapping.findElement(By.name("role-8"))).selectByValue("ignored");
        assertFalse(browser.byId("mapping-warning").isDisplayed());
        browser.byId("import-button").click();
        browser.await(d -> browser.byId("import-message").getText().startsWith("Name the classes"), "the classes asked for");
        mapping.findElement(By.name("classes")).sendKeys("wet,dry");
        browser.byId("import-button").click();
        browser.await(d -> !d.findElements(By.id("new-pool-link")).isEmpty(), "the import to finish");
        var pool = db.pools().require("scans");
        assertEquals(List.of("wet", "dry"), pool.classes());
        assertEquals(0, db.labels().counts(pool.id()).size(), "nothing labelled: the pool starts from scratch");
        assertEquals("1007", db.records().page(pool.id(), 1, 1).get(0).key());
    }

    @Test
    void displayFieldsAreTextNeverMarkup() throws Exception {
        String csv = "id,reading,remark,state\n"
                + "h1,1.0,<script>window.__pwned = 1</script>,\n"
                + "h2,2.0,\"<img src=x onerror=\"\"window.__pwned = 2\"\">\",\n"
                + "k1,0.5,plain,ok\n"
                + "k2,3.5,plain,fault\n";
        HttpResponse<String> up = http.send(asLead("api/v1/imports?pool=hostile&file_name=h.csv&id=id&label=state&wait=true")
                .POST(HttpRequest.BodyPublishers.ofString(csv)).build(), HttpResponse.BodyHandlers.ofString());
        assertEquals(201, up.statusCode(), up.body());
        server.requestRound("hostile");
        long pool = db.pools().require("hostile").id();
        TestSupport.await(Duration.ofSeconds(60), () -> db.queues().servedRound(pool).isPresent(), "the first round");

        signIn("labeller-b");
        browser.driver.get(base() + "desk.html?pool=hostile");
        List<String> seen = new ArrayList<>();
        for (int i = 0; i < 2; i++) {
            int shownBefore = seen.size();
            String id = browser.await(d -> {
                String now = cardId();
                return now.isEmpty() || seen.contains(now) ? null : now;
            }, "a hostile record on the desk");
            seen.add(id);
            String text = browser.byId("card").getText();
            if (id.equals("h1")) {
                assertTrue(text.contains("<script>window.__pwned = 1</script>"), text);
            } else {
                assertTrue(text.contains("<img src=x onerror=\"window.__pwned = 2\">"), text);
            }
            assertTrue(browser.byId("card").findElements(By.tagName("img")).isEmpty(), "markup became an element");
            assertTrue(browser.byId("card").findElements(By.tagName("script")).isEmpty(), "markup became an element");
            browser.screenshot("8-desk-hostile-" + id);
            assertEquals(shownBefore + 1, seen.size());
            press("1");
        }
        assertNull(browser.driver.executeScript("return window.__pwned === undefined ? null : window.__pwned;"));

        signIn(LEAD);
        browser.driver.get(base() + "?pool=hostile");
        browser.await(d -> browser.byId("records").findElements(By.className("record")).size() == 4, "the record cards");
        String cards = browser.byId("records").getText();
        assertTrue(cards.contains("<script>window.__pwned = 1</script>"), cards);
        assertTrue(browser.byId("records").findElements(By.tagName("img")).isEmpty());
        assertNull(browser.driver.executeScript("return window.__pwned === undefined ? null : window.__pwned;"));
    }

    @Test
    void aFailedRoundShowsOnTheOverviewWhileTheLastQueueStaysServed() throws Exception {
        String csv = "id,reading\nk1,0.5\nk2,3.5\nu1,1.0\nu2,2.0\nu3,2.5\nu4,3.0\n";
        HttpResponse<String> up = http.send(asLead("api/v1/imports?pool=gauges&file_name=g.csv&id=id&classes=ok,fault&wait=true")
                .POST(HttpRequest.BodyPublishers.ofString(csv)).build(), HttpResponse.BodyHandlers.ofString());
        assertEquals(201, up.statusCode(), up.body());
        long poolId = db.pools().require("gauges").id();
        // Round 1 has no labels to learn from: its queue is spread over the pool, no chains yet. The server
        // starts it by itself.
        awaitRound(poolId, 1, RoundStatus.PUBLISHED);
        for (String[] l : new String[][] {{"k1", "ok"}, {"k2", "fault"}}) {
            HttpResponse<String> r = http.send(asLead("api/v1/pools/gauges/labels")
                    .POST(HttpRequest.BodyPublishers.ofString("{\"record\":\"" + l[0] + "\",\"label\":\"" + l[1]
                            + "\"}")).build(), HttpResponse.BodyHandlers.ofString());
            assertEquals(201, r.statusCode(), r.body());
        }

        // The same database behind a server whose sampler diverges at every step (plain SGLD with an
        // absurd learning rate): its first sampled round fails (the server starts it by itself, since the
        // served batch is nearly all labelled), and the queue served before stays in service.
        server.close();
        int served = db.queues().servedRound(poolId).orElseThrow();
        SamplerConfig broken = TestSupport.quickSampler().toBuilder().kernel(KernelChoice.SGLD).learningRate(1e30)
                .build();
        server = WebServer.start(db, new WebConfig("127.0.0.1", 0, 1 << 20, dir.resolve("uploads")), broken,
                TestSupport.FAST_TEAM);
        server.requestRound("gauges");
        TestSupport.await(Duration.ofSeconds(60), () -> {
            var latest = db.rounds().latest(poolId).orElseThrow();
            return latest.round() > served && latest.status() == RoundStatus.FAILED;
        }, "a failed round");
        int failed = db.rounds().latest(poolId).orElseThrow().round();
        assertEquals(served, db.queues().servedRound(poolId).orElseThrow());

        signIn(LEAD);
        browser.driver.get(base() + "overview.html?pool=gauges");
        browser.await(d -> browser.byId("overview-message").getText().contains("Round " + failed + " failed"),
                "the failure on the overview");
        assertTrue(browser.byId("overview-message").getText().contains("previous queue stays in service"));
        browser.await(d -> browser.byId("queue-title").getText().contains("round " + served), "the last queue still served");
        assertFalse(browser.byId("queue").findElements(By.cssSelector("tbody tr")).isEmpty());
        browser.screenshot("9-overview-failed-round");
    }

    /** The round the desk's progress line says is served, or 0. */
    private int servedRoundShown() {
        java.util.regex.Matcher m = java.util.regex.Pattern.compile("round (\\d+)").matcher(browser.byId("progress").getText());
        return m.find() ? Integer.parseInt(m.group(1)) : 0;
    }

    private void awaitRound(long poolId, int round, RoundStatus status) {
        TestSupport.await(Duration.ofSeconds(60), () -> {
            var rounds = db.rounds().list(poolId);
            return !rounds.isEmpty() && rounds.get(0).round() == round && rounds.get(0).status() == status;
        }, "round " + round + " to become " + status.word());
    }
}
