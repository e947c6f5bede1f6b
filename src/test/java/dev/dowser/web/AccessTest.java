package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.json.Json;
import dev.dowser.store.Database;
import dev.dowser.team.Accounts;
import dev.dowser.team.Role;
import dev.dowser.team.TeamConfig;
import java.io.InputStream;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.KeyStore;
import java.security.SecureRandom;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import javax.net.ssl.SSLContext;
import javax.net.ssl.TrustManagerFactory;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Every API call and page, tried with no session, with each role, and as a forged cross-site
 * request, against a table written out here by hand (not read from {@link Routes}): a denied call
 * gets exactly 401 or 403, an allowed one anything else but a server error. The table must name every route the
 * server has, so a new route cannot go untested; and the server's table is the only place a handler is mounted,
 * so a call missing from it is refused (404), whatever code exists for it.
 */
class AccessTest {

    /** method, path with its placeholders, a concrete path, and who may call it ("-" for anyone). */
    private static final String[][] API = {
        {"POST", "/session", "/session", "-"},
        {"GET", "/session", "/session", "labeller reviewer admin"},
        {"DELETE", "/session", "/session", "labeller reviewer admin"},
        {"PUT", "/session/password", "/session/password", "labeller reviewer admin"},
        {"GET", "/tokens", "/tokens", "labeller reviewer admin"},
        {"POST", "/tokens", "/tokens", "labeller reviewer admin"},
        {"DELETE", "/tokens/{id}", "/tokens/99", "labeller reviewer admin"},
        {"GET", "/users", "/users", "admin"},
        {"POST", "/users", "/users", "admin"},
        {"PUT", "/users/{name}", "/users/nobody", "admin"},
        {"GET", "/users/{name}/tokens", "/users/nobody/tokens", "admin"},
        {"DELETE", "/users/{name}/tokens/{id}", "/users/nobody/tokens/99", "admin"},
        {"GET", "/pools", "/pools", "labeller reviewer admin"},
        {"GET", "/pools/{pool}", "/pools/p", "labeller reviewer admin"},
        {"GET", "/pools/{pool}/records", "/pools/p/records", "reviewer admin"},
        {"GET", "/pools/{pool}/export", "/pools/p/export", "admin"},
        {"GET", "/pools/{pool}/export/metadata", "/pools/p/export/metadata", "admin"},
        {"POST", "/imports", "/imports?pool=q", "admin"},
        {"GET", "/imports/{id}", "/imports/99", "admin"},
        {"POST", "/previews", "/previews?file_name=x.csv", "admin"},
        {"POST", "/pools/{pool}/queue/next", "/pools/p/queue/next", "labeller reviewer admin"},
        {"POST", "/pools/{pool}/queue/skip", "/pools/p/queue/skip", "labeller reviewer admin"},
        {"POST", "/pools/{pool}/queue/release", "/pools/p/queue/release", "labeller reviewer admin"},
        {"POST", "/pools/{pool}/labels", "/pools/p/labels", "labeller reviewer admin"},
        {"POST", "/pools/{pool}/labels/undo", "/pools/p/labels/undo", "labeller reviewer admin"},
        {"GET", "/pools/{pool}/labels/mine", "/pools/p/labels/mine", "labeller reviewer admin"},
        {"GET", "/pools/{pool}/rounds", "/pools/p/rounds", "labeller reviewer admin"},
        {"POST", "/pools/{pool}/rounds", "/pools/p/rounds", "reviewer admin"},
        {"GET", "/pools/{pool}/queue", "/pools/p/queue", "labeller reviewer admin"},
        {"GET", "/pools/{pool}/accuracy", "/pools/p/accuracy", "labeller reviewer admin"},
        {"GET", "/pools/{pool}/advice", "/pools/p/advice", "labeller reviewer admin"},
        {"GET", "/pools/{pool}/settings", "/pools/p/settings", "labeller reviewer admin"},
        {"PUT", "/pools/{pool}/settings", "/pools/p/settings", "admin"},
        {"GET", "/pools/{pool}/settings/history", "/pools/p/settings/history", "reviewer admin"},
        {"GET", "/pools/{pool}/review", "/pools/p/review", "reviewer admin"},
        {"POST", "/pools/{pool}/reviews", "/pools/p/reviews", "reviewer admin"},
        {"GET", "/pools/{pool}/records/{record}/history", "/pools/p/records/a/history", "reviewer admin"},
        {"GET", "/pools/{pool}/agreement", "/pools/p/agreement", "labeller reviewer admin"},
        {"GET", "/events", "/events?pool=p", "labeller reviewer admin"},
    };

    private static final String[][] PAGES = {
        {"/login.html", "-"},
        {"/", "labeller reviewer admin"},
        {"/index.html", "labeller reviewer admin"},
        {"/desk.html", "labeller reviewer admin"},
        {"/overview.html", "labeller reviewer admin"},
        {"/account.html", "labeller reviewer admin"},
        {"/review.html", "reviewer admin"},
        {"/users.html", "admin"},
    };

    @TempDir
    Path dir;
    Database db;
    WebServer server;
    Accounts accounts;
    final HttpClient http = HttpClient.newHttpClient();

    @BeforeEach
    void start() throws Exception {
        db = TestSupport.openDb(dir.resolve("db"));
        server = TestSupport.quickServer(db, dir, 1 << 20);
        accounts = new Accounts(db, new SecureRandom(), TestSupport.FAST_TEAM);
        for (Role r : Role.values()) {
            accounts.add(r.word() + "-1", r, TestSupport.TEST_PASSWORD, "test");
        }
        TestSupport.importText(db, "p", "id,x\na,1\nb,2\n", TestSupport.csv("p").withClasses(List.of("yes", "no")));
    }

    @AfterEach
    void stop() {
        server.close();
        db.close();
    }

    @Test
    void theTableNamesEveryRouteTheServerHas() {
        Set<String> ours = new TreeSet<>();
        for (String[] row : API) {
            ours.add(row[0] + " " + row[1] + " " + row[3]);
        }
        Set<String> served = new TreeSet<>();
        for (Route r : server.routes().api()) {
            served.add(r.method() + " " + r.template() + " " + words(r.roles()));
        }
        assertEquals(served, ours);
        Set<String> pages = new TreeSet<>();
        for (String[] row : PAGES) {
            pages.add(row[0] + " " + row[1]);
        }
        Set<String> serverPages = new TreeSet<>();
        for (Route r : server.routes().pages()) {
            serverPages.add(r.template() + " " + words(r.roles()));
        }
        assertEquals(serverPages, pages);
    }

    @Test
    void everyCallGetsExactlyItsAllowedOutcome() throws Exception {
        List<String> wrong = new ArrayList<>();
        for (String[] row : API) {
            String method = row[0];
            String path = "/api/v1" + row[2];
            boolean open = row[3].equals("-");
            int anonymous = status(method, path, null, false, false);
            if (open ? anonymous == 401 || anonymous == 403 : anonymous != 401) {
                wrong.add(method + " " + path + " with no session: " + anonymous);
            }
            for (Role role : Role.values()) {
                boolean allowed = open || row[3].contains(role.word());
                int s = status(method, path, role, true, false);
                if (allowed ? s == 401 || s == 403 || s >= 500 : s != 403) {
                    wrong.add(method + " " + path + " as " + role.word() + ": " + s);
                }
            }
            // A page on another site making the admin's browser send this, cookie and all.
            boolean unsafe = !method.equals("GET");
            int forged = status(method, path, Role.ADMIN, false, true);
            if (unsafe ? forged != 403 : forged == 401 || forged == 403) {
                wrong.add(method + " " + path + " forged from another site: " + forged);
            }
            // The same without the forgery token but from our own origin: refused too.
            if (unsafe && !open) {
                int tokenless = status(method, path, Role.ADMIN, false, false);
                if (tokenless != 403) {
                    wrong.add(method + " " + path + " without the forgery token: " + tokenless);
                }
            }
        }
        for (String[] row : PAGES) {
            boolean open = row[1].equals("-");
            int anonymous = status("GET", row[0], null, false, false);
            if (open ? anonymous != 200 : anonymous != 303) {
                wrong.add("page " + row[0] + " with no session: " + anonymous + " (a sign-in redirect expected)");
            }
            for (Role role : Role.values()) {
                boolean allowed = open || row[1].contains(role.word());
                int s = status("GET", row[0], role, false, false);
                if (allowed ? s == 401 || s == 403 || s == 303 : s != 403) {
                    wrong.add("page " + row[0] + " as " + role.word() + ": " + s);
                }
            }
        }
        assertEquals(List.of(), wrong);
    }

    @Test
    void unknownCallsAreNamedAndEveryResponseCarriesTheSecurityHeaders() throws Exception {
        HttpResponse<String> none = http.send(request("GET", "/api/v1/nothing", null, false, false).build(),
                HttpResponse.BodyHandlers.ofString());
        assertEquals(404, none.statusCode());
        assertTrue(none.body().contains("no API call GET /api/v1/nothing"), none.body());
        HttpResponse<String> method = http.send(request("PATCH", "/api/v1/pools", null, false, false).build(),
                HttpResponse.BodyHandlers.ofString());
        assertEquals(405, method.statusCode());
        for (String path : List.of("/login.html", "/api/v1/session", "/js/api.js", "/api/v1/pools")) {
            HttpResponse<String> r = http.send(request("GET", path, null, false, false).build(),
                    HttpResponse.BodyHandlers.ofString());
            // The policy is the common-practice strict set: our own scripts and styles only, no framing.
            assertEquals(Gate.CONTENT_SECURITY_POLICY, r.headers().firstValue("content-security-policy").orElse(""), path);
            assertTrue(Gate.CONTENT_SECURITY_POLICY.contains("frame-ancestors 'none'"));
            assertEquals("nosniff", r.headers().firstValue("x-content-type-options").orElse(""), path);
            assertEquals("same-origin", r.headers().firstValue("referrer-policy").orElse(""), path);
        }
    }

    @Test
    void signingInSetsAStrictCookieAndSigningOutEndsItOnTheServer() throws Exception {
        HttpResponse<String> in = http.send(request("POST", "/api/v1/session", null, false, false)
                .POST(HttpRequest.BodyPublishers.ofString("{\"name\":\"labeller-1\",\"password\":\""
                        + TestSupport.TEST_PASSWORD + "\"}")).build(), HttpResponse.BodyHandlers.ofString());
        assertEquals(200, in.statusCode(), in.body());
        String cookie = in.headers().firstValue("set-cookie").orElseThrow();
        assertTrue(cookie.startsWith(Gate.SESSION_COOKIE + "="), cookie);
        assertTrue(cookie.contains("HttpOnly") && cookie.contains("SameSite=Strict"), cookie);
        assertFalse(cookie.contains("Secure"), "plain HTTP on loopback: " + cookie);
        String token = cookie.substring(cookie.indexOf('=') + 1, cookie.indexOf(';'));
        assertEquals(43, token.length(), "256 bits in unpadded base64url");
        String csrf = Json.tree(in.body()).get("csrf").asText();
        HttpRequest.Builder out = HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + server.port()
                + "/api/v1/session")).header("Cookie", Gate.SESSION_COOKIE + "=" + token).header(Gate.CSRF_HEADER, csrf);
        assertEquals(200, http.send(out.copy().DELETE().build(), HttpResponse.BodyHandlers.ofString()).statusCode());
        assertEquals(401, http.send(out.copy().GET().build(), HttpResponse.BodyHandlers.ofString()).statusCode(),
                "the cookie still in hand no longer signs in");

        HttpResponse<String> held = null;
        for (int i = 0; i <= TeamConfig.DEFAULT_FREE_FAILURES; i++) {
            held = http.send(request("POST", "/api/v1/session", null, false, false)
                    .POST(HttpRequest.BodyPublishers.ofString("{\"name\":\"admin-1\",\"password\":\"not it at all\"}"))
                    .build(), HttpResponse.BodyHandlers.ofString());
        }
        assertEquals(429, held.statusCode(), held.body());
        assertTrue(held.headers().firstValue("retry-after").isPresent());
        assertTrue(held.body().contains("too many failed sign-ins"), held.body());
    }

    @Test
    void behindATlsProxyTheCookieIsSecure() throws Exception {
        server.close();
        server = WebServer.start(db, new WebConfig("127.0.0.1", 0, 1 << 20, dir.resolve("uploads"), true, null),
                TestSupport.quickSampler(), TestSupport.FAST_TEAM);
        HttpResponse<String> in = http.send(request("POST", "/api/v1/session", null, false, false)
                .header("X-Forwarded-Proto", "https")
                .POST(HttpRequest.BodyPublishers.ofString("{\"name\":\"reviewer-1\",\"password\":\""
                        + TestSupport.TEST_PASSWORD + "\"}")).build(), HttpResponse.BodyHandlers.ofString());
        assertEquals(200, in.statusCode(), in.body());
        String cookie = in.headers().firstValue("set-cookie").orElseThrow();
        assertTrue(cookie.contains("Secure") && cookie.contains("HttpOnly"), cookie);
    }

    @Test
    void overHttpsTheCookieIsSecure() throws Exception {
        // A self-signed certificate for 127.0.0.1, made by the JDK's own keytool.
        Path keystore = dir.resolve("server.p12");
        Process keytool = new ProcessBuilder(Path.of(System.getProperty("java.home"), "bin", "keytool").toString(),
                "-genkeypair", "-alias", "dowser", "-keyalg", "EC", "-groupname", "secp256r1", "-validity", "2",
                "-dname", "CN=127.0.0.1", "-ext", "san=ip:127.0.0.1", "-storetype", "PKCS12",
                "-keystore", keystore.toString(), "-storepass", "test-store-pass", "-keypass", "test-store-pass")
                .redirectErrorStream(true).start();
        String said = new String(keytool.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        assertEquals(0, keytool.waitFor(), said);
        server.close();
        server = WebServer.start(db, new WebConfig("127.0.0.1", 0, 1 << 20, dir.resolve("uploads"))
                .withTls(new TlsConfig(keystore, "test-store-pass")), TestSupport.quickSampler(), TestSupport.FAST_TEAM);
        assertTrue(server.address().startsWith("https://127.0.0.1:"), server.address());

        KeyStore trusted = KeyStore.getInstance("PKCS12");
        try (InputStream in = Files.newInputStream(keystore)) {
            trusted.load(in, "test-store-pass".toCharArray());
        }
        TrustManagerFactory trust = TrustManagerFactory.getInstance(TrustManagerFactory.getDefaultAlgorithm());
        trust.init(trusted);
        SSLContext context = SSLContext.getInstance("TLS");
        context.init(null, trust.getTrustManagers(), null);
        HttpClient https = HttpClient.newBuilder().sslContext(context).build();
        HttpResponse<String> in = https.send(HttpRequest.newBuilder(URI.create(server.address() + "api/v1/session"))
                .POST(HttpRequest.BodyPublishers.ofString("{\"name\":\"admin-1\",\"password\":\""
                        + TestSupport.TEST_PASSWORD + "\"}")).build(), HttpResponse.BodyHandlers.ofString());
        assertEquals(200, in.statusCode(), in.body());
        String cookie = in.headers().firstValue("set-cookie").orElseThrow();
        assertTrue(cookie.contains("Secure") && cookie.contains("SameSite=Strict"), cookie);
        assertEquals("max-age=31536000", in.headers().firstValue("strict-transport-security").orElse(""));

        IllegalArgumentException wrong = assertThrows(IllegalArgumentException.class,
                () -> new TlsConfig(keystore, "not the password").context());
        assertTrue(wrong.getMessage().contains("is the password right?"), wrong.getMessage());
    }

    /** The status of one call; the response body is closed unread (the event stream never ends). */
    private int status(String method, String path, Role role, boolean withCsrf, boolean forged) throws Exception {
        HttpResponse<InputStream> r = http.send(request(method, path, role, withCsrf, forged).build(),
                HttpResponse.BodyHandlers.ofInputStream());
        r.body().close();
        return r.statusCode();
    }

    /** A request signed in through a fresh browser session of {@code role}, or anonymous when null. */
    private HttpRequest.Builder request(String method, String path, Role role, boolean withCsrf, boolean forged) {
        HttpRequest.Builder b = HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + server.port() + path))
                .method(method, method.equals("GET") ? HttpRequest.BodyPublishers.noBody()
                        : HttpRequest.BodyPublishers.ofString("{}"));
        if (role != null) {
            Accounts.SignIn in = accounts.login(role.word() + "-1", TestSupport.TEST_PASSWORD, "127.0.0.1");
            b.header("Cookie", Gate.SESSION_COOKIE + "=" + in.token());
            if (withCsrf) {
                b.header(Gate.CSRF_HEADER, in.caller().csrfToken());
            }
        }
        if (forged) {
            b.header("Origin", "http://attacker.example");
        }
        return b;
    }

    private static String words(Set<Role> roles) {
        if (roles.isEmpty()) {
            return "-";
        }
        List<String> w = new ArrayList<>();
        for (Role r : Role.values()) {
            if (roles.contains(r)) {
                w.add(r.word());
            }
        }
        return String.join(" ", w);
    }
}
