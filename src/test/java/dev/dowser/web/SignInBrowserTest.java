package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.team.Role;
import java.net.URI;
import java.net.URLEncoder;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.util.List;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.WebElement;

/** Signing in in the real browser: where it leads afterwards, and an admin revoking someone's API token. */
class SignInBrowserTest extends BrowserFixture {

    final HttpClient http = HttpClient.newHttpClient();

    @BeforeEach
    void start() {
        db = TestSupport.openDb(dir.resolve("db"));
        server = TestSupport.quickServer(db, dir, 1 << 20);
        TestSupport.tokenFor(db, "lead", Role.ADMIN);
        browser = Browser.shared();
    }

    /** Signs in from {@code login.html?next=NEXT} (NEXT encoded here); returns where the browser went. */
    private String signInWithNext(String next) {
        return signInFrom("login.html?next=" + URLEncoder.encode(next, StandardCharsets.UTF_8));
    }

    /** Signs in from {@code page} (its query as given); returns where the browser went. */
    private String signInFrom(String page) {
        browser.driver.manage().deleteAllCookies();
        browser.driver.get(base() + page);
        signInHere("lead");
        return browser.driver.getCurrentUrl();
    }

    /** Issue 11: {@code login.html?next=/%5Cevil.example} led to another site after signing in. */
    @Test
    void afterSigningInOnlyPagesOfThisSiteAreFollowed() {
        assertEquals(base(), signInFrom("login.html?next=/%5Cevil.example"), "the issue's own address");
        for (String hostile : List.of("/\\evil.example", "//evil.example/x", "/\\/evil.example", "https://evil.example/",
                "/\t/evil.example", "javascript:alert(1)", " //evil.example")) {
            String went = signInWithNext(hostile);
            assertEquals(base(), went, hostile + " should lead to the pools page");
        }
        assertEquals(base() + "users.html?x=1#add-user", signInWithNext("/users.html?x=1#add-user"),
                "a page of this site is followed, with its query and fragment");
    }

    /** Issue 11: an admin could not revoke another person's token. Now the accounts page lists and revokes them. */
    @Test
    void anAdminRevokesSomeoneElsesToken() throws Exception {
        String ana = TestSupport.tokenFor(db, "ana", Role.LABELLER);
        assertEquals(200, get(ana).statusCode());
        signInWithNext("/users.html");
        WebElement show = browser.await(d -> d.findElement(By.xpath("//tr[@data-user='ana']//button[@class='tokens-of']")),
                "ana's tokens button");
        assertEquals("1 live", show.getText());
        show.click();
        WebElement revoke = browser.await(d -> d.findElement(By.xpath("//tr[@class='token-list']//button[text()='Revoke']")),
                "ana's token listed");
        browser.screenshot("16-admin-revokes-a-token");
        revoke.click();
        browser.await(d -> browser.byId("users-message").getText().equals("Revoked ana's token “test”."), "the revocation");
        browser.await(d -> d.findElement(By.xpath("//tr[@data-user='ana']/td[5]")).getText().equals("none"),
                "ana left with no live token");
        assertEquals(401, get(ana).statusCode(), "the revoked token stops at once");
    }

    private HttpResponse<String> get(String token) throws Exception {
        return http.send(HttpRequest.newBuilder(URI.create(base() + "api/v1/pools")).header("Authorization", "Bearer " + token)
                .build(), HttpResponse.BodyHandlers.ofString());
    }
}
