package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.demo.DemoPool;
import dev.dowser.store.QueueStore;
import dev.dowser.team.Accounts;
import dev.dowser.team.Role;
import java.security.SecureRandom;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.Dimension;
import org.openqa.selenium.WebElement;
import org.openqa.selenium.interactions.Actions;

/** The demo's first minute as a newcomer lives it: sign in, land on the desk, see a pump trace, label it. */
class DemoBrowserTest extends BrowserFixture {

    @BeforeEach
    void start() {
        db = TestSupport.openDb(dir.resolve("db"));
        DemoPool.load(db, dir.resolve("db"), 300, DemoPool.DEFAULT_SEED);
        Accounts accounts = new Accounts(db, new SecureRandom(), TestSupport.FAST_TEAM);
        accounts.add("demo-labeller", Role.LABELLER, TestSupport.TEST_PASSWORD, "demo");
        accounts.add("demo-lead", Role.ADMIN, TestSupport.TEST_PASSWORD, "demo");
        server = TestSupport.quickServer(db, dir, 1 << 20);
        server.requestRound(DemoPool.POOL);
        browser = Browser.shared();
    }

    @Test
    void theDeskAddressLeadsThroughSignInToAPumpTrace() {
        String base = base();
        // The address the demo prints; signing in brings the person back to it.
        browser.driver.get(base + "desk.html?pool=" + DemoPool.POOL);
        signInHere("demo-labeller");
        browser.await(d -> d.getCurrentUrl().contains("desk.html?pool=" + DemoPool.POOL), "back at the desk");
        String first = browser.await(d -> browser.byId("card").isDisplayed() ? browser.byId("card-id").getText() : null,
                "the first record");
        WebElement card = browser.byId("card");
        assertFalse(card.findElements(By.tagName("polyline")).isEmpty(), "the vibration trace is drawn as a line");
        // On the pool's scale, with its unit from the column's name; one click shows the record's own range.
        WebElement trace = card.findElement(By.className("trace"));
        assertTrue(trace.getText().contains("sample · values in g"), trace.getText());
        String poolScale = trace.findElement(By.className("trace-y")).getText();
        assertTrue(trace.findElement(By.tagName("svg")).getAttribute("aria-label").endsWith("drawn on the pool's scale"));
        trace.findElement(By.className("scale-toggle")).click();
        assertTrue(trace.findElement(By.tagName("svg")).getAttribute("aria-label").endsWith("drawn on its own scale"));
        assertFalse(poolScale.equals(trace.findElement(By.className("trace-y")).getText()), "the axis follows the scale");
        trace.findElement(By.className("scale-toggle")).click();
        assertTrue(browser.byId("choices").getText().contains("cavitation"), browser.byId("choices").getText());
        String why = browser.byId("card-why").getText();
        assertTrue(why.startsWith("First batch: picked to cover the pool") || why.startsWith("Spot check")
                || why.startsWith("Second opinion"), "round 1 has no scores to show: " + why);
        browser.screenshot("17-demo-desk");
        new Actions(browser.driver).sendKeys("1").perform();
        browser.await(d -> !browser.byId("card-id").getText().equals(first), "the next record");
        assertTrue(browser.byId("progress").getText().contains("1 labelled this session"), browser.byId("progress").getText());

        // A phone in the night shift: nothing scrolls sideways, the classes are in reach, the theme is dark.
        browser.driver.executeCdpCommand("Emulation.setEmulatedMedia", Map.of("features",
                List.of(Map.of("name", "prefers-color-scheme", "value", "dark"))));
        browser.driver.manage().window().setSize(new Dimension(390, 844));
        browser.await(d -> ((Number) browser.driver.executeScript("return window.innerWidth;")).intValue() <= 400,
                "the phone-sized window");
        long overflow = ((Number) browser.driver.executeScript(
                "return document.documentElement.scrollWidth - window.innerWidth;")).longValue();
        assertTrue(overflow <= 0, "the desk scrolls sideways by " + overflow + " px at phone width");
        String background = (String) browser.driver.executeScript(
                "return getComputedStyle(document.documentElement).backgroundColor;");
        assertEquals("rgb(16, 21, 31)", background, "the dark theme follows prefers-color-scheme");
        for (WebElement link : browser.driver.findElements(By.tagName("a"))) {
            String colour = link.getCssValue("color");
            assertTrue(!colour.equals("rgba(0, 0, 238, 1)") && !colour.equals("rgba(85, 26, 139, 1)"),
                    "a link in the browser's own blue: " + link.getText());
        }
        browser.screenshot("17b-demo-desk-phone-dark");
        browser.driver.manage().window().setSize(new Dimension(820, 1180));
        browser.driver.executeCdpCommand("Emulation.setEmulatedMedia", Map.of("features",
                List.of(Map.of("name", "prefers-color-scheme", "value", "light"))));
        overflow = ((Number) browser.driver.executeScript(
                "return document.documentElement.scrollWidth - window.innerWidth;")).longValue();
        assertTrue(overflow <= 0, "the desk scrolls sideways by " + overflow + " px at tablet width");
        browser.screenshot("17c-demo-desk-tablet");
    }

    /** Whatever of the page lies beyond the right edge of what it shows, in pixels (0 when nothing scrolls sideways). */
    private long overflow() {
        return ((Number) browser.driver.executeScript(
                "return document.documentElement.scrollWidth - document.documentElement.clientWidth;")).longValue();
    }

    private void theme(String scheme) {
        browser.driver.executeCdpCommand("Emulation.setEmulatedMedia", Map.of("features",
                List.of(Map.of("name", "prefers-color-scheme", "value", scheme))));
    }

    /**
     * Every page an admin reaches, on a phone in the dark theme and on a laptop in the light one:
     * nothing scrolls sideways, nothing is in the browser's own link blue, and each leaves a
     * screenshot (18-page-NAME-phone-dark, 18-page-NAME-light) for a person to look at.
     */
    @Test
    void everyPageFitsAPhoneInBothThemes() {
        String base = base();
        signIn("demo-lead");
        // A few labels, so that the review page and the overview have something to show.
        browser.driver.get(base + "desk.html?pool=" + DemoPool.POOL);
        for (int i = 0; i < 3; i++) {
            String shown = browser.await(d -> browser.byId("card").isDisplayed() ? browser.byId("card-id").getText() : null,
                    "a record on the desk");
            new Actions(browser.driver).sendKeys(String.valueOf(1 + i)).perform();
            browser.await(d -> !browser.byId("card-id").getText().equals(shown), "the record after " + shown);
        }
        // A record sent to two people, labelled by one so far: the overview's queue marks it as waiting.
        long poolId = db.pools().require(DemoPool.POOL).id();
        QueueStore.Served twice = db.queues().served(poolId).stream()
                .filter(e -> e.entry().copies() == 2 && !e.labelled() && !e.awaitingSecondLabel()).findFirst()
                .orElseThrow(() -> new AssertionError("no record of the served queue goes to two people"));
        db.labels().add(poolId, twice.entry().row(), "healthy", "demo-labeller", null);
        browser.driver.get(base + "overview.html?pool=" + DemoPool.POOL);
        WebElement waiting = browser.await(d -> d.findElements(By.cssSelector("#queue tr.waiting")).stream().findFirst()
                .orElse(null), "a queue row waiting for its second label");
        assertTrue(waiting.getText().contains("waits for a second label"), waiting.getText());
        // Records of the first batch were picked before any model: a dash, not a score of 0.
        for (WebElement row : browser.driver.findElements(By.cssSelector("#queue tbody tr"))) {
            List<WebElement> cells = row.findElements(By.tagName("td"));
            if (cells.get(3).getText().startsWith("first batch") || cells.get(3).getText().startsWith("spot check")) {
                assertEquals("—", cells.get(2).getText(), row.getText());
            }
        }
        Map<String, String> pages = Map.of("pools", "", "pool", "?pool=" + DemoPool.POOL,
                "overview", "overview.html?pool=" + DemoPool.POOL, "desk", "desk.html?pool=" + DemoPool.POOL,
                "review", "review.html?pool=" + DemoPool.POOL, "accounts", "users.html", "account", "account.html");
        for (String scheme : List.of("dark", "light")) {
            theme(scheme);
            boolean phone = scheme.equals("dark");
            // A phone as its browser lays pages out: 390 px wide, scroll bars drawn over the page.
            browser.driver.executeCdpCommand("Emulation.setDeviceMetricsOverride", Map.of("width", phone ? 390 : Browser.WIDTH,
                    "height", phone ? 844 : Browser.HEIGHT, "deviceScaleFactor", 1, "mobile", phone));
            int width = phone ? 390 : Browser.WIDTH;
            for (Map.Entry<String, String> page : new java.util.TreeMap<>(pages).entrySet()) {
                browser.driver.get(base + page.getValue());
                // Each page fills itself from the API: wait until its main section shows and its lists have come.
                browser.await(d -> (Boolean) browser.driver.executeScript("return document.readyState === 'complete'"
                        + " && !!document.querySelector('main section:not([hidden]), main #desk:not([hidden])');"),
                        page.getKey() + " page shown");
                // ...and its calls have come back: the count of finished calls holds still between two looks.
                long[] seen = {-1};
                browser.await(d -> {
                    long calls = ((Number) browser.driver.executeScript("return performance.getEntriesByType('resource')"
                            + ".filter((e) => e.initiatorType === 'fetch').length;")).longValue();
                    boolean still = calls > 0 && calls == seen[0];
                    seen[0] = calls;
                    return still ? true : null;
                }, page.getKey() + " page's calls answered");
                browser.await(d -> overflow() <= 0 ? true : null, page.getKey() + " at " + width
                        + " px wide without sideways scrolling (" + overflow() + " px over)");
                for (WebElement link : browser.driver.findElements(By.tagName("a"))) {
                    String colour = link.getCssValue("color");
                    assertTrue(!colour.equals("rgba(0, 0, 238, 1)") && !colour.equals("rgba(85, 26, 139, 1)"),
                            "a link in the browser's own blue on the " + page.getKey() + " page: " + link.getText());
                }
                if (page.getKey().equals("accounts")) {
                    // Dates read the same in every locale: 2026-12-02, never 12/2/2026.
                    String since = browser.driver.findElement(By.cssSelector("#users tbody tr td:nth-child(4)")).getText();
                    assertTrue(since.matches("\\d{4}-\\d{2}-\\d{2}"), since);
                }
                if (page.getKey().equals("account")) {
                    assertFalse(browser.byId("tokens").isDisplayed(), "an empty token table's header shown");
                    assertTrue(browser.byId("tokens-none").isDisplayed());
                }
                if (page.getKey().equals("desk") || page.getKey().equals("review")) {
                    // Where labels can hurt someone: the model's view is a suggestion, and local rules decide.
                    String caution = browser.driver.findElement(By.className("caution")).getText();
                    assertTrue(caution.contains("suggestion, not ground truth")
                            && caution.contains("local rules and licensed practice"), caution);
                }
                if (phone) {
                    assertEquals("rgb(16, 21, 31)", browser.driver.executeScript(
                            "return getComputedStyle(document.documentElement).backgroundColor;"), page.getKey());
                }
                browser.screenshotWholePage("18-page-" + page.getKey() + (phone ? "-phone-dark" : "-light"));
            }
        }
    }
}
