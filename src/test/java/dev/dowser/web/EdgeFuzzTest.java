package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.store.Database;
import dev.dowser.team.Role;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.AtomicLong;
import java.util.function.Consumer;
import java.util.function.ToIntFunction;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;

/**
 * Generated input against the real server on a loopback port and its H2 file database: files to
 * import and to preview, and every JSON body of the API, from every kind of caller (our own seeded
 * generators: {@link FuzzInputs}, {@link FuzzCalls}, {@link HostileText}; run by {@link Tries}). No
 * input may get a 500, and an input refused (any 4xx) must leave the stored data exactly as it
 * was: no partial write.
 *
 * <p>{@code ./dowser test} runs the tests without the {@code bench} tag: one fixed root seed and a
 * few hundred inputs each, the same inputs every run. {@code dowser bench --only fuzz} runs the
 * tagged ones with the seed in {@code dowser.fuzz.seed} (a fresh one, printed) and
 * {@code dowser.fuzz.tries} inputs each (100,000 in all), new pools getting no first round by
 * themselves ({@code dowser.fuzz.bench}), and writes its counts to the file named by
 * {@code dowser.fuzz.report} (with {@code -Ddowser.fuzz.messages=1}, also how often each kind of
 * refusal came, to compare and tune the generators). A failure names the seed of the smallest
 * failing input; {@code -Ddowser.fuzz.replay=SEED} runs that one input again.
 */
class EdgeFuzzTest {

    static final long SUITE_SEED = 20261203L;
    static final int SUITE_TRIES = 300;
    static final int REPORT_EVERY = 1_000;
    /** The properties, in the order of their seeds under the root seed. */
    static final List<String> PROPERTIES = List.of("imports", "previews", "json");

    private static Path dir;
    private static Database db;
    private static WebServer server;
    private static Fingerprint fingerprint;
    private static final HttpClient HTTP = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(10)).build();
    private static final Map<String, String> TOKENS = new ConcurrentHashMap<>();
    private static final Map<String, AtomicLong> COUNTS = new ConcurrentHashMap<>();

    @BeforeAll
    static void start() throws IOException {
        dir = Files.createTempDirectory("dowser-fuzz-");
        db = TestSupport.openDb(dir.resolve("db"));
        server = WebServer.start(db, new WebConfig("127.0.0.1", 0, 1 << 20, dir.resolve("uploads"))
                .withLimits(ClientLimits.defaults().withBodyTimeouts(10_000, 10_000)), TestSupport.quickSampler(),
                TestSupport.FAST_TEAM);
        TOKENS.put("admin", TestSupport.tokenFor(db, "ana", Role.ADMIN));
        TOKENS.put("labeller", TestSupport.tokenFor(db, "leo", Role.LABELLER));
        TestSupport.importText(db, "p", "id,flow,site,label\na1,1.5,north,ok\na2,2.5,south,\na3,0.5,north,fault\n",
                TestSupport.csv("p").withId("id").withLabel("label").withFeatures(List.of("flow", "site")));
        fingerprint = new Fingerprint(dir.resolve("db"));
        if (Boolean.getBoolean("dowser.fuzz.bench")) {
            // The campaign makes thousands of pools; their first rounds would take most of its time and
            // test nothing of the edge. The suite keeps them, so rounds still run beside its imports.
            server.stopRoundWatch();
        }
    }

    @AfterAll
    static void stop() throws IOException {
        writeReport();
        fingerprint.close();
        server.close();
        db.close();
        TestSupport.deleteTree(dir);
    }

    // ---- the suite: one fixed root seed, a few hundred inputs each -------------------------------

    @Test
    void importsNeverFailOrWriteHalf() {
        run("imports", "importsNeverFailOrWriteHalf", SUITE_SEED, SUITE_TRIES,
                FuzzInputs.uploads(), FuzzInputs.Upload::size, EdgeFuzzTest::checkImport);
    }

    @Test
    void previewsNeverFail() {
        run("previews", "previewsNeverFail", SUITE_SEED, SUITE_TRIES,
                FuzzInputs.heads(), FuzzInputs.Upload::size, EdgeFuzzTest::checkPreview);
    }

    @Test
    void jsonBodiesNeverFailOrWriteHalf() {
        run("json", "jsonBodiesNeverFailOrWriteHalf", SUITE_SEED, SUITE_TRIES,
                FuzzCalls.calls(), FuzzInputs.Call::size, EdgeFuzzTest::checkCall);
    }

    // ---- the bench: the seed and the number of inputs it is given ------------------------------

    @Test
    @Tag("bench")
    void importsNeverFailOrWriteHalfAtLength() {
        run("imports", "importsNeverFailOrWriteHalf", benchSeed(), benchTries(),
                FuzzInputs.uploads(), FuzzInputs.Upload::size, EdgeFuzzTest::checkImport);
    }

    @Test
    @Tag("bench")
    void previewsNeverFailAtLength() {
        run("previews", "previewsNeverFail", benchSeed(), benchTries(),
                FuzzInputs.heads(), FuzzInputs.Upload::size, EdgeFuzzTest::checkPreview);
    }

    @Test
    @Tag("bench")
    void jsonBodiesNeverFailOrWriteHalfAtLength() {
        run("json", "jsonBodiesNeverFailOrWriteHalf", benchSeed(), benchTries(),
                FuzzCalls.calls(), FuzzInputs.Call::size, EdgeFuzzTest::checkCall);
    }

    private static long benchSeed() {
        String seed = System.getProperty("dowser.fuzz.seed");
        if (seed == null || seed.isBlank()) {
            throw new IllegalStateException("the bench's fuzz tests need -Ddowser.fuzz.seed (dowser bench --only fuzz sets it)");
        }
        return Long.parseLong(seed.trim());
    }

    private static int benchTries() {
        return Integer.getInteger("dowser.fuzz.tries", SUITE_TRIES);
    }

    /** Runs one property under its branch of the seed tree, and writes the seed of a failure to the report too. */
    private static <T> void run(String property, String suiteTest, long root, int tries, Gen<T> gen,
            ToIntFunction<T> size, Consumer<T> check) {
        long seed = Tries.propertySeed(root, PROPERTIES.indexOf(property));
        try {
            Tries.run("EdgeFuzzTest#" + suiteTest, seed, tries, gen, size, check);
        } catch (Tries.Failed e) {
            COUNTS.computeIfAbsent("failing_seed_" + property, k -> new AtomicLong()).set(e.seed);
            throw e;
        }
    }

    // ---- the checks ----------------------------------------------------------------------------

    private static void checkImport(FuzzInputs.Upload u) {
        Map<String, String> before = fingerprint.takeImportTables();
        HttpResponse<String> r = send("admin", "POST", "/api/v1/imports?" + u.query() + "&wait=true", u.body());
        count("import", r.statusCode());
        assertTrue(r.statusCode() == 201 || r.statusCode() == 400 || r.statusCode() == 413,
                "import answered " + r.statusCode() + ": " + r.body() + "\nfor " + u);
        Map<String, String> after = fingerprint.takeImportTables();
        if (r.statusCode() != 201) {
            assertUnchanged(before, after, "a refused import changed the database: " + r.body() + "\nfor " + u);
        } else {
            COUNTS.computeIfAbsent("import_pools_made", k -> new AtomicLong()).incrementAndGet();
            assertEquals(Long.parseLong(before.get("count:pools")) + 1, Long.parseLong(after.get("count:pools")));
        }
        assertError(r, "import");
    }

    private static void checkPreview(FuzzInputs.Upload u) {
        Map<String, String> before = fingerprint.take();
        HttpResponse<String> r = send("admin", "POST", "/api/v1/previews?" + u.query(), u.body());
        count("preview", r.statusCode());
        assertTrue(r.statusCode() == 200 || r.statusCode() == 400 || r.statusCode() == 413,
                "preview answered " + r.statusCode() + ": " + r.body() + "\nfor " + u);
        assertUnchanged(before, fingerprint.take(), "a preview changed the database");
        assertError(r, "preview");
    }

    private static void checkCall(FuzzInputs.Call c) {
        Map<String, String> before = fingerprint.take();
        HttpResponse<String> r = send(c.caller(), c.method(), c.path(), c.body());
        count("json", r.statusCode());
        assertTrue(r.statusCode() < 500, c.method() + " " + c.path() + " answered " + r.statusCode() + ": " + r.body()
                + "\nfor " + c);
        if (r.statusCode() >= 400) {
            assertUnchanged(before, fingerprint.take(), "a refused call changed the database: " + r.body() + "\nfor " + c);
        } else if (c.path().startsWith("/api/v1/users/leo")) {
            // The admin disabled leo or set his password, which revokes his token: give him a new one.
            var accounts = new dev.dowser.team.Accounts(db, new java.security.SecureRandom(), TestSupport.FAST_TEAM);
            accounts.setDisabled("leo", false, "fuzz");
            TOKENS.put("labeller", accounts.newToken(new dev.dowser.team.Caller("leo", Role.LABELLER, null, null), "fuzz"));
        }
        assertError(r, "json");
    }

    /** The database as it was; counted either way, so the report says how many were looked at and how many differed. */
    private static void assertUnchanged(Map<String, String> before, Map<String, String> after, String message) {
        COUNTS.computeIfAbsent("unchanged_checks", k -> new AtomicLong()).incrementAndGet();
        COUNTS.computeIfAbsent("partial_writes", k -> new AtomicLong());
        if (!before.equals(after)) {
            COUNTS.get("partial_writes").incrementAndGet();
        }
        assertEquals(before, after, message);
    }

    /** A refusal is one JSON object with a message a person can read. */
    private static void assertError(HttpResponse<String> r, String target) {
        if (r.statusCode() >= 400) {
            String error = dev.dowser.json.Json.tree(r.body()).path("error").asText("");
            if (System.getProperty("dowser.fuzz.messages") != null) {
                String kind = error.replaceAll("'[^']*'", "'…'").replaceAll("\\d+", "N");
                COUNTS.computeIfAbsent("msg " + target + " " + kind.substring(0, Math.min(70, kind.length())), k -> new AtomicLong())
                        .incrementAndGet();
            }
            assertTrue(!error.isBlank() && !error.contains("Exception"), "no message, or a Java one: " + r.body());
        }
    }

    /** The counts so far, to the file the bench names: written as it goes too, so a campaign cut short still says what it did. */
    private static synchronized void writeReport() throws IOException {
        String report = System.getProperty("dowser.fuzz.report");
        if (report != null) {
            Path part = Path.of(report + ".part");
            try (Writer w = Files.newBufferedWriter(part)) {
                for (var e : new TreeMap<>(COUNTS).entrySet()) {
                    w.write("fuzz_" + e.getKey() + "=" + e.getValue().get() + "\n");
                }
            }
            Files.move(part, Path.of(report), java.nio.file.StandardCopyOption.REPLACE_EXISTING);
        }
    }

    private static void count(String target, int status) {
        if (COUNTS.computeIfAbsent("inputs", k -> new AtomicLong()).get() % REPORT_EVERY == 0) {
            try {
                writeReport();
            } catch (IOException e) {
                throw new UncheckedIOException(e);
            }
        }
        COUNTS.computeIfAbsent(target + "_inputs", k -> new AtomicLong()).incrementAndGet();
        COUNTS.computeIfAbsent(target + "_status_" + status, k -> new AtomicLong()).incrementAndGet();
        COUNTS.computeIfAbsent("inputs", k -> new AtomicLong()).incrementAndGet();
        COUNTS.computeIfAbsent("status_500", k -> new AtomicLong());
        if (status >= 500) {
            COUNTS.get("status_500").incrementAndGet();
        }
    }

    private static HttpResponse<String> send(String caller, String method, String path, byte[] body) {
        HttpRequest.Builder b = HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + server.port() + path))
                .timeout(Duration.ofSeconds(60))
                .method(method, body == null ? HttpRequest.BodyPublishers.noBody() : HttpRequest.BodyPublishers.ofByteArray(body));
        if (TOKENS.containsKey(caller)) {
            b.header("Authorization", "Bearer " + TOKENS.get(caller));
        }
        try {
            return HTTP.send(b.build(), HttpResponse.BodyHandlers.ofString());
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException(e);
        }
    }
}
