package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.TestSupport;
import dev.dowser.json.Json;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.team.Role;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.time.Duration;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.Keys;
import org.openqa.selenium.WebElement;
import org.openqa.selenium.support.ui.Select;

/**
 * The team pages in the real browser: what a labeller may not reach or see, a reviewer settling a
 * disagreement between two labellers, agreement on the overview, and an admin managing accounts.
 */
class TeamBrowserTest extends BrowserFixture {

    final HttpClient http = HttpClient.newHttpClient();
    final Map<String, String> tokens = new HashMap<>();

    @BeforeEach
    void start() throws Exception {
        db = TestSupport.openDb(dir.resolve("db"));
        // A small pool whose every queued record goes to two people, set so before the server starts:
        // a server serves a new pool's first batch by itself, with the settings it has at that moment.
        TestSupport.importText(db, "gauges", "id,reading\ng1,0.5\ng2,3.5\ng3,1.0\ng4,2.0\ng5,2.5\ng6,3.0\n",
                TestSupport.csv("gauges").withId("id").withClasses(List.of("ok", "fault")));
        db.pools().updateSettings(db.pools().require("gauges").id(), new PoolSettings(6, 0, 10,
                PoolSettings.DEFAULT_STRATEGY, 1.0).toJson(), "test");
        server = TestSupport.quickServer(db, dir, 1 << 20);
        tokens.put("lead", TestSupport.tokenFor(db, "lead", Role.ADMIN));
        tokens.put("rey", TestSupport.tokenFor(db, "rey", Role.REVIEWER));
        tokens.put("ana", TestSupport.tokenFor(db, "ana", Role.LABELLER));
        tokens.put("ben", TestSupport.tokenFor(db, "ben", Role.LABELLER));
        browser = Browser.shared();

        // Ana and ben label all of them, agreeing on some and not on others.
        long pool = db.pools().require("gauges").id();
        TestSupport.await(Duration.ofSeconds(60), () -> db.queues().servedRound(pool).isPresent(), "the first round");
        for (String person : List.of("ana", "ben")) {
            for (int i = 0; i < 6; i++) {
                JsonNode next = Json.tree(call(person, "POST", "api/v1/pools/gauges/queue/next", "{}").body());
                String id = next.at("/record/id").asText();
                assertTrue(next.hasNonNull("record"), person + " " + i + ": " + next);
                String label = person.equals("ben") && (id.equals("g2") || id.equals("g5")) ? "ok"
                        : Double.parseDouble(next.at("/record/fields/reading").asText()) > 2.2 ? "fault" : "ok";
                assertEquals(201, call(person, "POST", "api/v1/pools/gauges/labels",
                        "{\"record\":\"" + id + "\",\"label\":\"" + label + "\"}").statusCode());
            }
        }
    }

    private HttpResponse<String> call(String who, String method, String path, String body) throws Exception {
        return http.send(HttpRequest.newBuilder(URI.create(base() + path)).header("Authorization", "Bearer " + tokens.get(who))
                .method(method, HttpRequest.BodyPublishers.ofString(body)).build(), HttpResponse.BodyHandlers.ofString());
    }

    /** Forgets whoever was signed in, then signs {@code name} in. */
    @Override
    void signIn(String name) {
        browser.driver.manage().deleteAllCookies();
        super.signIn(name);
    }

    @Test
    void aLabellerReachesNeitherReviewNorAccountsAndSeesNoExport() {
        signIn("ana");
        browser.driver.get(base() + "overview.html?pool=gauges");
        browser.await(d -> browser.byId("pool-facts").getText().contains("6 records"), "the overview");
        browser.await(d -> !browser.byId("account").getText().isEmpty(), "the account corner");
        assertTrue(browser.driver.findElements(By.id("export-csv")).isEmpty(), "an export button for a labeller");
        assertTrue(browser.driver.findElements(By.id("export-jsonl")).isEmpty());
        assertTrue(browser.driver.findElements(By.id("to-review")).isEmpty());
        assertTrue(browser.driver.findElements(By.id("round-now")).isEmpty());
        assertTrue(browser.byId("account").findElements(By.linkText("review")).isEmpty());
        assertTrue(browser.byId("account").findElements(By.linkText("accounts")).isEmpty());
        browser.screenshot("10-overview-as-labeller");

        for (String page : List.of("review.html?pool=gauges", "users.html")) {
            browser.driver.get(base() + page);
            String text = browser.driver.findElement(By.tagName("body")).getText();
            assertTrue(text.contains("an account with the role labeller may not do this"), page + ": " + text);
            // In the frame of every page, with the way back.
            assertTrue(browser.driver.findElement(By.className("masthead")).isDisplayed(), page);
            assertEquals(base(), browser.driver.findElement(By.linkText("Back to the pools")).getAttribute("href"));
        }
        browser.screenshot("10b-forbidden-page");
        browser.driver.get(base() + "?pool=gauges");
        browser.await(d -> !browser.byId("pool-title").getText().isEmpty(), "the pool page");
        assertTrue(browser.driver.findElements(By.id("export-csv")).isEmpty());
        assertTrue(browser.driver.findElements(By.id("add-pool")).isEmpty(), "the import form for a labeller");
    }

    @Test
    void aReviewerSettlesADisagreementAndTheOverviewShowsAgreement() {
        signIn("rey");
        browser.driver.get(base() + "review.html?pool=gauges");
        browser.await(d -> browser.byId("review-facts").getText().contains("of 6"), "six labelled records");
        new Select(browser.byId("filters").findElement(By.name("show"))).selectByValue("disagree");
        browser.byId("filters").findElement(By.cssSelector("button[type=submit]")).click();
        browser.await(d -> browser.byId("review-facts").getText().contains("of 2"), "the two disagreements");
        WebElement g2 = browser.await(d -> d.findElement(By.cssSelector("[data-record='g2']")), "record g2");
        assertTrue(g2.getText().contains("ana: fault") && g2.getText().contains("ben: ok"), g2.getText());
        assertTrue(g2.findElement(By.className("accept")).getAttribute("disabled") != null,
                "accept is for agreed labels; a disagreement needs an override");
        browser.screenshot("11-review-disagreements");
        // Nothing is chosen at first: a reason and Enter alone save nothing.
        assertTrue(g2.findElements(By.cssSelector(".choice[aria-checked=true]")).isEmpty(), "a class preselected");
        g2.findElement(By.className("reason")).sendKeys("reading 3.5 is past the fault line", Keys.ENTER);
        browser.await(d -> browser.byId("review-message").getText().contains("g2: choose the new label first"),
                "the refusal without a chosen class");
        // The desk's key chooses on the review page too: fault is the second class, key 2.
        g2.sendKeys("2");
        browser.await(d -> "true".equals(g2.findElement(By.cssSelector(".choice[data-label=fault]"))
                .getAttribute("aria-checked")), "fault chosen by its key");
        g2.findElement(By.className("override")).click();
        String sentence = browser.await(d -> g2.findElement(By.className("confirm")).isDisplayed()
                ? g2.findElement(By.className("confirm-text")).getText() : null, "the confirmation");
        assertEquals("Change the final label of g2 from unresolved (ana: fault, ben: ok) to fault?", sentence);
        assertEquals(0, db.labels().history(db.pools().require("gauges").id(),
                db.records().requireRow(db.pools().require("gauges"), "g2")).stream()
                .filter(e -> !e.kind().equals("label")).count(), "nothing saved before the confirmation");
        browser.screenshot("11b-review-confirm");
        g2.findElement(By.className("confirm-yes")).click();
        browser.await(d -> browser.byId("review-message").getText().contains("g2: final label fault"), "the override");
        // The list is drawn again after the decision; wait for the new card, then use it.
        WebElement settled = browser.await(d -> {
            WebElement card = d.findElement(By.cssSelector("[data-record='g2']"));
            return card.getText().contains("rey overrode: fault — reading 3.5 is past the fault line") ? card : null;
        }, "g2 showing the override");
        settled.findElement(By.xpath(".//button[text()='History']")).click();
        browser.await(d -> d.findElement(By.cssSelector("[data-record='g2'] .history")).getText().contains("override"),
                "the record's history");
        String history = browser.driver.findElement(By.cssSelector("[data-record='g2'] .history")).getText();
        assertTrue(history.contains("ana · label fault") && history.contains("ben · label ok"), history);
        browser.screenshot("12-review-history");
        // The review page on a phone: nothing scrolls sideways.
        browser.driver.manage().window().setSize(new org.openqa.selenium.Dimension(390, 844));
        browser.await(d -> ((Number) browser.driver.executeScript("return window.innerWidth;")).intValue() <= 400,
                "the phone-sized window");
        long overflow = ((Number) browser.driver.executeScript(
                "return document.documentElement.scrollWidth - window.innerWidth;")).longValue();
        browser.screenshot("12b-review-phone");
        assertTrue(overflow <= 0, "the review page scrolls sideways by " + overflow + " px at phone width");
        browser.driver.manage().window().setSize(new org.openqa.selenium.Dimension(Browser.WIDTH, Browser.HEIGHT));

        // A later review reverses this one; the history keeps both.
        WebElement again = browser.await(d -> d.findElement(By.cssSelector("[data-record='g2']")), "g2 again");
        again.sendKeys("1");
        again.findElement(By.className("reason")).sendKeys("second look: the gauge was miscalibrated", Keys.ENTER);
        browser.await(d -> again.findElement(By.className("confirm")).isDisplayed(), "the second confirmation");
        assertEquals("Change the final label of g2 from fault to ok?", again.findElement(By.className("confirm-text")).getText());
        again.findElement(By.className("confirm-yes")).sendKeys(Keys.ENTER);
        browser.await(d -> browser.byId("review-message").getText().contains("g2: final label ok"), "the reversal");
        List<String> kinds = db.labels().history(db.pools().require("gauges").id(),
                db.records().requireRow(db.pools().require("gauges"), "g2")).stream().map(e -> e.kind()).toList();
        assertEquals(List.of("label", "label", "override", "override"), kinds);

        browser.driver.get(base() + "overview.html?pool=gauges");
        browser.await(d -> browser.byId("agreement-facts").getText().contains("Fleiss' kappa over 6 records"), "agreement");
        assertTrue(browser.byId("pairs").getText().contains("ana & ben"), browser.byId("pairs").getText());
        browser.screenshot("13-overview-agreement");
    }

    @Test
    void anAdminAddsAndDisablesAnAccount() throws Exception {
        signIn("lead");
        browser.driver.get(base() + "users.html");
        browser.await(d -> d.findElements(By.cssSelector("#users tbody tr")).size() == 4, "four accounts");
        WebElement add = browser.byId("add-user");
        add.findElement(By.name("account")).sendKeys("newcomer");
        new Select(add.findElement(By.name("role"))).selectByValue("reviewer");
        add.findElement(By.name("password")).sendKeys("a fine long password");
        add.findElement(By.cssSelector("button[type=submit]")).click();
        browser.await(d -> d.findElements(By.cssSelector("#users tbody tr")).size() == 5, "the new account listed");
        WebElement row = browser.driver.findElement(By.cssSelector("#users tr[data-user='ben']"));
        row.findElement(By.xpath(".//button[text()='Disable']")).click();
        browser.await(d -> d.findElement(By.cssSelector("#users tr[data-user='ben']")).getText().contains("disabled"),
                "ben disabled");
        browser.screenshot("14-accounts");
        assertEquals(401, call("ben", "GET", "api/v1/pools", "").statusCode(), "ben's token stops at once");
        assertEquals("reviewer", db.users().require("newcomer").role());
    }

    @Test
    void anyoneMakesATokenShownOnceAndRevokesIt() throws Exception {
        signIn("ana");
        browser.driver.get(base() + "account.html");
        browser.await(d -> browser.byId("me").getText().equals("ana · labeller"), "the account page");
        browser.byId("new-token").findElement(By.name("purpose")).sendKeys("nightly script", Keys.ENTER);
        String token = browser.await(d -> browser.byId("token-shown").isDisplayed() ? browser.byId("token-text").getText() : null,
                "the new token");
        assertTrue(token.matches("dowser\\.[0-9a-z]{52}\\.[0-9a-z]{7}"), token);
        tokens.put("script", token);
        assertEquals(200, call("script", "GET", "api/v1/pools", "").statusCode());
        browser.screenshot("15-account-token");
        browser.await(d -> d.findElements(By.xpath("//table[@id='tokens']//button[text()='Revoke']")).size() == 2,
                "two live tokens: the test's and the new one");
        WebElement row = browser.driver.findElement(By.xpath("//table[@id='tokens']//tr[td[text()='nightly script']]"));
        row.findElement(By.tagName("button")).click();
        browser.await(d -> browser.byId("tokens-message").getText()
                .equals("Revoked the token “nightly script”: it no longer signs anything in."), "the revocation");
        browser.await(d -> d.findElements(By.xpath("//table[@id='tokens']//tr[td[text()='nightly script']]")).isEmpty(),
                "the revoked token gone from the list");
        assertEquals(1, browser.driver.findElements(By.xpath("//table[@id='tokens']//button[text()='Revoke']")).size());
        assertEquals(401, call("script", "GET", "api/v1/pools", "").statusCode(), "a revoked token stops at once");
    }

    @Test
    void settingsChangesAreKeptWithWhoAndWhen() {
        signIn("lead");
        browser.driver.get(base() + "overview.html?pool=gauges");
        WebElement batch = browser.await(d -> {
            WebElement in = browser.byId("settings").findElement(By.name("batch_size"));
            return "6".equals(in.getAttribute("value")) ? in : null;
        }, "the settings form");
        batch.clear();
        batch.sendKeys("7");
        new Select(browser.byId("settings").findElement(By.name("cold_start"))).selectByValue("kmeans++");
        browser.byId("settings-save").click();
        browser.await(d -> browser.byId("settings-history").getText().contains("lead · labels per round 6 → 7"), "the change listed");
        // Every setting is in the form, the first batch's spread too, and kept in the API's names.
        assertTrue(browser.byId("settings-history").getText().contains(
                "first batch spread by typical records of clusters (TypiClust) → k-means++ seeding"),
                browser.byId("settings-history").getText());
        assertEquals("kmeans++", Json.tree(db.pools().require("gauges").settingsJson()).get("cold_start").asText());
        // The setting made through the API before is listed too, with its before and after.
        assertTrue(browser.byId("settings-history").getText().contains("share sent to two people 0.1 → 1"),
                browser.byId("settings-history").getText());
        assertEquals(2, db.history().of(db.pools().require("gauges").id(), "settings").size());
        browser.screenshot("16-overview-settings");

        signIn("rey");
        browser.driver.get(base() + "overview.html?pool=gauges");
        browser.await(d -> browser.byId("settings-history").getText().contains("labels per round 6 → 7"), "the history for a reviewer");
        assertTrue(browser.driver.findElements(By.id("settings-save")).isEmpty(), "a reviewer cannot save settings");
        assertTrue(browser.byId("settings").findElement(By.name("batch_size")).getAttribute("disabled") != null);
    }
}
