package dev.dowser.web;

import dev.dowser.TestSupport;
import dev.dowser.store.Database;
import dev.dowser.team.Role;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.io.TempDir;
import org.openqa.selenium.By;
import org.openqa.selenium.Keys;
import org.openqa.selenium.WebElement;

/**
 * What a browser test stands on: its own folder for the H2 file database, the real server on a
 * loopback port and the shared headless Chromium. Each test opens what it needs in its own order
 * (a pool set up before the server starts watching it, say); all is closed after it, the browser first.
 */
abstract class BrowserFixture {

    @TempDir
    Path dir;
    Database db;
    WebServer server;
    Browser browser;

    @AfterEach
    void closeAll() {
        if (browser != null) {
            browser.close();
        }
        if (server != null) {
            server.close();
        }
        if (db != null) {
            db.close();
        }
    }

    /**
     * Pool "gauges" (200 readings r0 to r199, classes ok and fault) with {@code labeller} on the team,
     * then the server and the shared browser; returns the pool's id.
     */
    long openGauges(String labeller) {
        db = TestSupport.openDb(dir.resolve("db"));
        StringBuilder csv = new StringBuilder("id,reading\n");
        for (int i = 0; i < 200; i++) {
            csv.append('r').append(i).append(',').append(i % 17).append('\n');
        }
        TestSupport.importText(db, "gauges", csv.toString(), TestSupport.csv("gauges").withId("id")
                .withClasses(List.of("ok", "fault")));
        TestSupport.tokenFor(db, labeller, Role.LABELLER);
        server = TestSupport.quickServer(db, dir, 1 << 20);
        browser = Browser.shared();
        return db.pools().require("gauges").id();
    }

    /** The id on the desk's card, or "" while none shows. */
    String cardId() {
        WebElement card = browser.byId("card");
        return card.isDisplayed() ? browser.byId("card-id").getText() : "";
    }

    /** The server's address, with its closing slash. */
    String base() {
        return "http://127.0.0.1:" + server.port() + "/";
    }

    /** Signs {@code name} in from a fresh sign-in page, with the test password. */
    void signIn(String name) {
        browser.driver.get(base() + "login.html");
        signInHere(name);
    }

    /** Fills in the sign-in form the browser shows (or is about to) as {@code name}, and waits to leave it. */
    void signInHere(String name) {
        WebElement form = browser.await(d -> browser.byId("sign-in").isDisplayed() ? browser.byId("sign-in") : null,
                "the sign-in form");
        form.findElement(By.name("account")).sendKeys(name);
        form.findElement(By.name("password")).sendKeys(TestSupport.TEST_PASSWORD, Keys.ENTER);
        browser.await(d -> !d.getCurrentUrl().contains("login.html"), "signing in as " + name);
    }
}
