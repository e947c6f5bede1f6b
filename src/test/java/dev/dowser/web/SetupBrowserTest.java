package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.store.Database;
import java.nio.file.Path;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.openqa.selenium.By;
import org.openqa.selenium.WebElement;

/** A server's first start: the sign-in page asks for the console's setup code and creates the first admin. */
class SetupBrowserTest {

    @TempDir
    Path dir;
    Database db;
    WebServer server;
    Browser browser;

    @BeforeEach
    void start() {
        db = TestSupport.openDb(dir.resolve("db"));
        server = WebServer.start(db, new WebConfig("127.0.0.1", 0, 1 << 20, dir.resolve("uploads")),
                TestSupport.quickSampler(), TestSupport.FAST_TEAM);
        browser = new Browser(dir.resolve("profile"));
    }

    @AfterEach
    void stop() {
        browser.close();
        server.close();
        db.close();
    }

    @Test
    void theFirstAdminIsMadeWithTheConsoleCode() {
        String code = server.setupCode().orElseThrow();
        browser.driver.get("http://127.0.0.1:" + server.port() + "/");
        WebElement form = browser.await(d -> d.getCurrentUrl().contains("login.html") && browser.byId("setup").isDisplayed()
                ? browser.byId("setup") : null, "the setup form");
        assertTrue(!browser.byId("sign-in").isDisplayed(), "no sign-in before there is an account");
        form.findElement(By.name("code")).sendKeys("not-the-code");
        form.findElement(By.name("account")).sendKeys("Ines Varga");
        form.findElement(By.name("password")).sendKeys("a long first password");
        form.findElement(By.name("again")).sendKeys("a long first password");
        form.findElement(By.cssSelector("button[type=submit]")).click();
        browser.await(d -> browser.byId("login-message").getText().contains("the setup code is wrong"), "the refusal");
        browser.screenshot("18-setup-refused");

        form.findElement(By.name("code")).clear();
        form.findElement(By.name("code")).sendKeys(code);
        form.findElement(By.cssSelector("button[type=submit]")).click();
        browser.await(d -> !d.getCurrentUrl().contains("login.html"), "signed in after setup");
        browser.await(d -> browser.byId("account").getText().contains("Ines Varga · admin"), "the new admin signed in");
        assertEquals("admin", db.users().require("Ines Varga").role());
        assertTrue(server.setupCode().isEmpty(), "the code is spent");
    }
}
