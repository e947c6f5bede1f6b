package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.demo.DemoPool;
import dev.dowser.store.Database;
import dev.dowser.team.Accounts;
import dev.dowser.team.Role;
import java.nio.file.Path;
import java.security.SecureRandom;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.openqa.selenium.By;
import org.openqa.selenium.Dimension;
import org.openqa.selenium.Keys;
import org.openqa.selenium.WebElement;
import org.openqa.selenium.interactions.Actions;

/** The demo's first minute as a newcomer lives it: sign in, land on the desk, see a pump trace, label it. */
class DemoBrowserTest {

    @TempDir
    Path dir;
    Database db;
    WebServer server;
    Browser browser;

    @BeforeEach
    void start() {
        db = TestSupport.openDb(dir.resolve("db"));
        DemoPool.load(db, dir.resolve("db"), 300, DemoPool.DEFAULT_SEED);
        new Accounts(db, new SecureRandom(), TestSupport.FAST_TEAM).add("demo-labeller", Role.LABELLER,
                TestSupport.TEST_PASSWORD, "demo");
        server = WebServer.start(db, new WebConfig("127.0.0.1", 0, 1 << 20, dir.resolve("uploads")),
                TestSupport.quickSampler(), TestSupport.FAST_TEAM);
        server.requestRound(DemoPool.POOL);
        browser = Browser.shared();
    }

    @AfterEach
    void stop() {
        browser.close();
        server.close();
        db.close();
    }

    @Test
    void theDeskAddressLeadsThroughSignInToAPumpTrace() {
        String base = "http://127.0.0.1:" + server.port() + "/";
        // The address the demo prints; signing in brings the person back to it.
        browser.driver.get(base + "desk.html?pool=" + DemoPool.POOL);
        WebElement form = browser.await(d -> d.getCurrentUrl().contains("login.html") && browser.byId("sign-in").isDisplayed()
                ? browser.byId("sign-in") : null, "the sign-in page");
        form.findElement(By.name("account")).sendKeys("demo-labeller");
        form.findElement(By.name("password")).sendKeys(TestSupport.TEST_PASSWORD, Keys.ENTER);
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
}
