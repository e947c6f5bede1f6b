package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.cli.Main;
import dev.dowser.store.Database;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.io.Writer;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.function.Function;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;
import org.openqa.selenium.By;
import org.openqa.selenium.Keys;
import org.openqa.selenium.WebElement;
import org.openqa.selenium.interactions.Actions;
import org.openqa.selenium.support.ui.Select;

/**
 * A newcomer's first hour, as one walk through the real server on a real H2 file database with
 * Debian's Chromium: the first admin is made the documented way (dowser users add) and signs in,
 * adds a labeller and a reviewer, uploads a generated 50 MB CSV through the page (the mapping step,
 * the progress bar), and the first batch is served without anyone asking. The labeller, in a second
 * browser, labels three whole batches by keyboard, skipping twice and undoing twice; every answer
 * shows a card while records remain. The reviewer overrides one label by an explicit choice, and
 * the admin's export holds exactly the labels given. Then the same for a pool whose classes are the
 * digits 0-9 (UCI's handwritten digits, as shipped by Debian's python3-sklearn), where each key is its
 * class's own name. Every step leaves a screenshot under target/screenshots/first-hour-*.
 */
class FirstHourBrowserTest {

    static final List<String> CONDITIONS = List.of("ok", "worn", "blocked");
    static final String[] SITES = {"Upper Fen", "Millrace", "Hollow Brook", "Tarn Gate"};
    static final long FILE_BYTES = 50L << 20;
    static final int TRACE = 32;
    /** Labels per round on a new pool (the default batch size): three whole batches. */
    static final int BATCHES = 3;
    /** An upload and import of 50 MB, or a first round, on a machine other builds share. */
    static final java.time.Duration SLOW = java.time.Duration.ofMinutes(5);

    @TempDir
    Path dir;
    Database db;
    WebServer server;
    Browser admin;
    Browser labeller;
    final HttpClient http = HttpClient.newHttpClient();
    String adminPassword;
    /** Pages' answers to queue/next without a record while records remain, counted in the labeller's browser. */
    static final String COUNT_EMPTY_ANSWERS = "if (!window.__counting) { window.__counting = true; window.__empty = 0;"
            + " window.__answers = 0; const f = window.fetch; window.fetch = async (...a) => { const r = await f(...a);"
            + " if (String(a[0]).endsWith('/queue/next')) { r.clone().json().then((j) => { window.__answers++;"
            + " if (!j.record) window.__empty++; }); } return r; }; }";

    @BeforeEach
    void start() {
        Path data = dir.resolve("data");
        // The README's way to make the first admin: on the command line, before the server starts.
        StringWriter out = new StringWriter();
        CommandLine cli = Main.commandLine();
        cli.setOut(new PrintWriter(out));
        cli.setErr(new PrintWriter(new StringWriter()));
        int exit = cli.execute("users", "add", "lead", "--role", "admin", "--data", data.toString());
        assertEquals(0, exit, out.toString());
        Matcher m = Pattern.compile("password: (\\S+)").matcher(out.toString());
        assertTrue(m.find(), "the new admin's password is printed once: " + out);
        adminPassword = m.group(1);
        db = TestSupport.openDb(data);
        server = TestSupport.quickServer(db, dir, 200L << 20);
        admin = Browser.shared();
        labeller = new Browser(dir.resolve("profile-labeller"));
    }

    @AfterEach
    void stop() {
        if (labeller != null) {
            labeller.close();
        }
        if (admin != null) {
            admin.close();
        }
        server.close();
        db.close();
    }

    private String base() {
        return "http://127.0.0.1:" + server.port() + "/";
    }

    private void shot(Browser b, String step) {
        b.screenshot("first-hour-" + step);
    }

    private void signIn(Browser b, String name, String password) {
        b.driver.manage().deleteAllCookies();
        b.driver.get(base() + "login.html");
        WebElement form = b.await(d -> b.byId("sign-in").isDisplayed() ? b.byId("sign-in") : null, "the sign-in form");
        form.findElement(By.name("account")).sendKeys(name);
        form.findElement(By.name("password")).sendKeys(password, Keys.ENTER);
        b.await(d -> !d.getCurrentUrl().contains("login.html"), "signing in as " + name);
    }

    /** The admin adds an account on the accounts page. */
    private void addAccount(String name, String role) {
        admin.driver.get(base() + "users.html");
        WebElement add = admin.await(d -> admin.byId("add-user").isDisplayed() ? admin.byId("add-user") : null,
                "the accounts page");
        add.findElement(By.name("account")).sendKeys(name);
        new Select(add.findElement(By.name("role"))).selectByValue(role);
        add.findElement(By.name("password")).sendKeys(TestSupport.TEST_PASSWORD);
        add.findElement(By.cssSelector("button[type=submit]")).click();
        admin.await(d -> !d.findElements(By.cssSelector("#users tr[data-user='" + name + "']")).isEmpty(),
                name + " listed");
    }

    /**
     * Readings of an invented plant: an id, a site, three numbers, a 32-sample vibration trace and a
     * remark; each reading's condition follows from its numbers, so the test answers as an expert would.
     */
    private Map<String, String> writeReadings(Path file) throws Exception {
        Map<String, String> truth = new HashMap<>();
        SplittableRandom rng = new SplittableRandom(20261202);
        try (Writer w = Files.newBufferedWriter(file)) {
            w.write("row_id,site,temp_c,flow_lps,rpm,vibration_g,remark\n");
            StringBuilder line = new StringBuilder(512);
            for (int i = 0; Files.size(file) < FILE_BYTES || i % 1000 != 0; i++) {
                int condition = rng.nextDouble() < 0.6 ? 0 : rng.nextDouble() < 0.5 ? 1 : 2;
                String id = String.format(Locale.ROOT, "R%07d", i + 1);
                truth.put(id, CONDITIONS.get(condition));
                line.setLength(0);
                line.append(id).append(',').append(SITES[rng.nextInt(SITES.length)]).append(',')
                        .append(String.format(Locale.ROOT, "%.1f,%.2f,%.0f,\"[", 40 + 10 * rng.nextGaussian(),
                                condition == 2 ? 5 + rng.nextDouble() : 30 + 5 * rng.nextGaussian(),
                                1450 + 20 * rng.nextGaussian()));
                double amplitude = condition == 1 ? 2.5 : 1.0;
                for (int t = 0; t < TRACE; t++) {
                    line.append(t == 0 ? "" : ",").append(String.format(Locale.ROOT, "%.2f",
                            amplitude * Math.sin(t * 0.8) + 0.2 * rng.nextGaussian()));
                }
                line.append("]\",").append("checked by the night shift after the weekly walk round\n");
                w.write(line.toString());
                if (i % 1000 == 999) {
                    w.flush();
                }
            }
        }
        return truth;
    }

    private String cardId() {
        WebElement card = labeller.byId("card");
        return card.isDisplayed() ? labeller.byId("card-id").getText() : "";
    }

    private void press(CharSequence key) {
        new Actions(labeller.driver).sendKeys(key).perform();
    }

    /** Waits for a card other than {@code shown}; an answer without a card while records remain fails the walk. */
    private String nextCard(String shown, String what) {
        return labeller.await(d -> {
            String now = cardId();
            return now.isEmpty() || now.equals(shown) ? null : now;
        }, what);
    }

    /** The export as the admin's browser session downloads it: id to final label and who decided. */
    private Map<String, String[]> export(String pool) throws Exception {
        String cookie = admin.driver.manage().getCookieNamed(Gate.SESSION_COOKIE).getValue();
        HttpResponse<String> r = http.send(HttpRequest.newBuilder(URI.create(base() + "api/v1/pools/" + pool
                + "/export?format=csv")).header("Cookie", Gate.SESSION_COOKIE + "=" + cookie).build(),
                HttpResponse.BodyHandlers.ofString());
        assertEquals(200, r.statusCode(), r.body());
        String[] lines = r.body().split("\r\n");
        List<String> header = List.of(lines[0].split(","));
        Map<String, String[]> out = new LinkedHashMap<>();
        for (int i = 1; i < lines.length; i++) {
            // The pools here have no quoted display values before the label's columns.
            String[] cells = lines[i].split(",(?=(?:[^\"]*\"[^\"]*\")*[^\"]*$)", -1);
            out.put(cells[header.indexOf("id")], new String[] {cells[header.indexOf("label")],
                    cells[header.indexOf("labelled_by")]});
        }
        return out;
    }

    /** What a labeller did at the desk: the labels that stand, the records skipped, the slips taken back. */
    record Walk(Map<String, String> given, List<String> skipped, int undos) {
    }

    /**
     * The labeller labels {@code BATCHES} whole batches by keyboard, answering as {@code truth} says:
     * Space skips at two steps, and at two others a wrong key slips, is seen at once, taken back by
     * Backspace and labelled right. Every answer of the desk shows a card (the pool has far more
     * records than this), and a skipped record never comes back to its labeller.
     */
    private Walk labelBatches(String step, Function<String, String> truth, Function<String, String> keyOf,
            Function<String, String> wrong) {
        labeller.driver.executeScript(COUNT_EMPTY_ANSWERS);
        Map<String, String> given = new LinkedHashMap<>();
        List<String> skipped = new ArrayList<>();
        int undos = 0;
        String shown = cardId();
        int target = BATCHES * 10;
        for (int n = 0; given.size() < target; n++) {
            String id = shown;
            assertFalse(skipped.contains(id), id + " was skipped and came back to the same labeller");
            if (n == 3 || n == 17) {
                press(" ");
                skipped.add(id);
                shown = nextCard(id, "a card after skipping " + id);
                continue;
            }
            String answer = truth.apply(id);
            boolean slip = n == 8 || n == 22;
            String pressed = slip ? wrong.apply(answer) : answer;
            press(keyOf.apply(pressed));
            given.put(id, pressed);
            shown = nextCard(id, "a card after labelling " + id + " (" + given.size() + " labels)");
            if (slip) {
                // The slip is seen at once: Backspace takes it back and the record comes back to be labelled right.
                press(Keys.BACK_SPACE);
                undos++;
                shown = labeller.await(d -> cardId().equals(id) ? id : null, "the slip on " + id + " shown again");
                given.remove(id);
                if (undos == 1) {
                    shot(labeller, step + "-desk-after-undo");
                }
                press(keyOf.apply(answer));
                given.put(id, answer);
                shown = nextCard(id, "a card after labelling " + id + " again");
            }
        }
        assertFalse(skipped.contains(shown), shown + " was skipped and came back to the same labeller");
        assertEquals(2, skipped.size());
        assertEquals(2, undos);
        int answers = target + skipped.size() + undos;
        labeller.await(d -> ((Number) labeller.driver.executeScript("return window.__answers;")).intValue() >= answers,
                "the desk's answers counted");
        assertEquals(0L, ((Number) labeller.driver.executeScript("return window.__empty;")).longValue(),
                "answers without a card while records remain");
        return new Walk(given, skipped, undos);
    }

    /**
     * The reviewer overrides the label of {@code reviewed} (on the review page's first page) with
     * another class chosen by its key, after checking that nothing was chosen for them; returns the new label.
     */
    private String override(String pool, String reviewed, String before, String after, String key, String step) {
        signIn(admin, "rey", TestSupport.TEST_PASSWORD);
        admin.driver.get(base() + "review.html?pool=" + pool);
        WebElement card = admin.await(d -> d.findElement(By.cssSelector("[data-record='" + reviewed + "']")),
                "the record to review");
        assertTrue(card.findElements(By.cssSelector(".choice[aria-checked=true]")).isEmpty(), "a class preselected");
        card.sendKeys(key);
        card.findElement(By.className("reason")).sendKeys("a second look at the record", Keys.ENTER);
        admin.await(d -> card.findElement(By.className("confirm")).isDisplayed(), "the confirmation");
        assertEquals("Change the final label of " + reviewed + " from " + before + " to " + after + "?",
                card.findElement(By.className("confirm-text")).getText());
        shot(admin, step + "-review-confirm");
        card.findElement(By.className("confirm-yes")).click();
        admin.await(d -> admin.byId("review-message").getText().contains(reviewed + ": final label " + after),
                "the override saved");
        return after;
    }

    /** The admin's export holds exactly the labels given, the override as the reviewer's. */
    private void exportHolds(String pool, Map<String, String> given, String reviewed) throws Exception {
        signIn(admin, "lead", adminPassword);
        Map<String, String[]> exported = export(pool);
        Map<String, String> labels = new HashMap<>();
        exported.forEach((id, row) -> labels.put(id, row[0]));
        assertEquals(new HashMap<>(given), labels, "the export of " + pool);
        assertEquals("rey", exported.get(reviewed)[1]);
        for (String id : given.keySet()) {
            if (!id.equals(reviewed)) {
                assertEquals("lee", exported.get(id)[1], "who labelled " + id);
            }
        }
    }

    @Test
    void aNewTeamsFirstHour() throws Exception {
        Path file = dir.resolve("plant-readings.csv");
        Map<String, String> truth = writeReadings(file);
        assertTrue(Files.size(file) >= FILE_BYTES, "the file is " + Files.size(file) + " bytes");

        // 1. The admin signs in with the printed password and adds a labeller and a reviewer.
        signIn(admin, "lead", adminPassword);
        shot(admin, "01-signed-in");
        addAccount("lee", "labeller");
        addAccount("rey", "reviewer");
        shot(admin, "02-accounts");

        // 2. The upload through the page: the mapping step, then the progress bar.
        admin.driver.get(base());
        admin.byId("import-form").findElement(By.name("pool")).sendKeys("plant");
        admin.byId("import-form").findElement(By.name("file")).sendKeys(file.toAbsolutePath().toString());
        admin.byId("preview-button").click();
        WebElement mapping = admin.await(d -> admin.byId("mapping").isDisplayed() ? admin.byId("mapping") : null,
                "the mapping step");
        assertEquals("id", new Select(mapping.findElement(By.name("role-0"))).getFirstSelectedOption().getAttribute("value"),
                "row_id suggested as the id");
        new Select(mapping.findElement(By.name("role-1"))).selectByValue("category-shown");
        mapping.findElement(By.name("classes")).sendKeys(String.join(",", CONDITIONS));
        shot(admin, "03-mapping");
        admin.byId("import-button").click();
        admin.await(d -> admin.byId("import-progress").isDisplayed(), "the progress bar");
        shot(admin, "04-importing");
        admin.await(d -> !d.findElements(By.id("new-pool-link")).isEmpty(), "the import of 50 MB to finish", SLOW);
        shot(admin, "05-imported");
        long records = db.pools().require("plant").recordCount();
        assertEquals(truth.size(), records);

        // 3. The first batch is served without anyone asking for a round.
        TestSupport.await(SLOW,
                () -> db.queues().servedRound(db.pools().require("plant").id()).isPresent(),
                "the first batch served without anyone asking");

        // 4. The labeller, in a second browser: three whole batches by keyboard, two skips, two undos.
        signIn(labeller, "lee", TestSupport.TEST_PASSWORD);
        labeller.driver.get(base() + "desk.html?pool=plant");
        labeller.await(d -> !cardId().isEmpty(), "the first card on the desk");
        shot(labeller, "06-desk");
        Function<String, String> key = c -> String.valueOf(CONDITIONS.indexOf(c) + 1);
        Function<String, String> other = c -> CONDITIONS.get((CONDITIONS.indexOf(c) + 1) % CONDITIONS.size());
        Walk walk = labelBatches("07", truth::get, key, other);
        shot(labeller, "08-desk-three-batches");

        // 5. The reviewer overrides one label by an explicit choice. The review page lists records in
        // pool order, a page at a time: the first of them is on the first page.
        Map<String, String> given = walk.given();
        String reviewed = given.keySet().stream().min(String::compareTo).orElseThrow();
        String after = other.apply(given.get(reviewed));
        given.put(reviewed, override("plant", reviewed, given.get(reviewed), after, key.apply(after), "09"));

        // 6. The admin exports: exactly the labels given, the override as the reviewer's.
        signIn(admin, "lead", adminPassword);
        admin.driver.get(base() + "overview.html?pool=plant");
        admin.await(d -> !admin.byId("queue").findElements(By.cssSelector("tbody tr")).isEmpty(), "the overview");
        shot(admin, "10-overview");
        exportHolds("plant", given, reviewed);
    }

    @Test
    void aPoolOfDigitsIsLabelledByTheirOwnKeys() throws Exception {
        TestSupport.OpenDataset digits = TestSupport.openDataset("digits", dir);
        List<String> lines = Files.readAllLines(digits.csv());
        signIn(admin, "lead", adminPassword);
        addAccount("lee", "labeller");
        addAccount("rey", "reviewer");
        admin.driver.get(base());
        admin.byId("import-form").findElement(By.name("pool")).sendKeys("digits");
        admin.byId("import-form").findElement(By.name("file")).sendKeys(digits.csv().toAbsolutePath().toString());
        admin.byId("preview-button").click();
        WebElement mapping = admin.await(d -> admin.byId("mapping").isDisplayed() ? admin.byId("mapping") : null,
                "the mapping step");
        // The file's own labels would make the pool fully labelled: the warning says so; label from scratch.
        assertTrue(admin.byId("mapping-warning").isDisplayed(), "no warning for a fully labelled file");
        new Select(mapping.findElement(By.name("role-64"))).selectByValue("ignored");
        mapping.findElement(By.name("classes")).sendKeys("0,1,2,3,4,5,6,7,8,9");
        shot(admin, "11-digits-mapping");
        admin.byId("import-button").click();
        admin.await(d -> !d.findElements(By.id("new-pool-link")).isEmpty(), "the digits import");
        TestSupport.await(SLOW,
                () -> db.queues().servedRound(db.pools().require("digits").id()).isPresent(),
                "the first batch of digits served without anyone asking");

        signIn(labeller, "lee", TestSupport.TEST_PASSWORD);
        labeller.driver.get(base() + "desk.html?pool=digits");
        labeller.await(d -> !cardId().isEmpty(), "the first digit on the desk");
        for (WebElement choice : labeller.byId("choices").findElements(By.className("choice"))) {
            assertEquals(choice.getAttribute("data-label"), choice.findElement(By.tagName("kbd")).getText(),
                    "each digit's key is the digit itself");
        }
        assertTrue(labeller.byId("card").findElement(By.tagName("canvas")).isDisplayed(), "the 8 x 8 image");
        shot(labeller, "12-digits-desk");
        // Records without an id column are named by their line in the file; the file's last column is the digit.
        Function<String, String> truth = id -> {
            String line = lines.get(Integer.parseInt(id) - 1);
            return line.substring(line.lastIndexOf(',') + 1);
        };
        Function<String, String> next = d -> String.valueOf((Integer.parseInt(d) + 1) % 10);
        Walk walk = labelBatches("13-digits", truth, Function.identity(), next);
        shot(labeller, "14-digits-three-batches");

        Map<String, String> given = walk.given();
        String reviewed = given.keySet().stream().min(Comparator.comparingInt(Integer::parseInt)).orElseThrow();
        String after = next.apply(given.get(reviewed));
        given.put(reviewed, override("digits", reviewed, given.get(reviewed), after, after, "15-digits"));
        exportHolds("digits", given, reviewed);
    }
}
