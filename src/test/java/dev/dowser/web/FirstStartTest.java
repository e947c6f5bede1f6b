package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.openqa.selenium.By;
import org.openqa.selenium.WebElement;

/**
 * A new server's first start, the documented way, as separate processes of the real command line:
 * {@code serve} on a fresh folder refuses and names the command that makes the first admin, and
 * leaves no folder behind; {@code users add} makes the admin; {@code serve} on a busy port says so in
 * one line and writes nothing; then it serves, and the admin signs in through the browser.
 */
class FirstStartTest {

    @TempDir
    Path dir;
    Process server;
    Browser browser;

    @AfterEach
    void stop() throws InterruptedException {
        if (browser != null) {
            browser.close();
        }
        if (server != null) {
            server.destroy();
            assertTrue(server.waitFor(30, TimeUnit.SECONDS), "the server stops on SIGTERM");
        }
    }

    record Run(int exit, String out, String err) {
    }

    @Test
    void theFirstAdminIsMadeOnTheCommandLineThenSignsIn() throws Exception {
        Path data = dir.resolve("team data");
        Run refused = run("serve", "--data", data.toString(), "--port", "0");
        assertEquals(2, refused.exit(), refused.err());
        assertEquals("dowser: there is no database in " + data + " yet, and a server needs an admin to manage it."
                + " Make the first one here with\n  dowser users add NAME --role admin --data '" + data + "'\n"
                + "(it prints a password to sign in with), then start dowser serve again.\n", refused.err());
        assertFalse(Files.exists(data), "a refused start makes no folder");

        Run added = run("users", "add", "Ines Varga", "--role", "admin", "--data", data.toString());
        assertEquals(0, added.exit(), added.err());
        String password = added.out().replaceAll("(?s).*password: (\\S+).*", "$1");

        try (ServerSocket taken = new ServerSocket(0, 1, InetAddress.getLoopbackAddress())) {
            Map<String, String> before = snapshot(data);
            Run busy = run("serve", "--data", data.toString(), "--port", String.valueOf(taken.getLocalPort()));
            assertEquals(2, busy.exit(), busy.err());
            assertEquals("dowser: cannot listen on 127.0.0.1 port " + taken.getLocalPort() + ": another program is"
                    + " using it; choose another port with --port\n", busy.err());
            assertEquals(before, snapshot(data), "a busy port leaves the data folder as it was");
        }

        server = command("serve", "--data", data.toString(), "--port", "0").start();
        String address = awaitLine(server, Pattern.compile("Dowser is serving (http://127\\.0\\.0\\.1:\\d+/)"));
        browser = new Browser(dir.resolve("profile"));
        browser.driver.get(address);
        WebElement form = browser.await(d -> d.getCurrentUrl().contains("login.html") ? browser.byId("sign-in") : null,
                "the sign-in page");
        assertTrue(browser.byId("sign-in").getText().contains("dowser users add NAME --role admin"));
        form.findElement(By.name("account")).sendKeys("Ines Varga");
        form.findElement(By.name("password")).sendKeys(password);
        browser.screenshot("18-first-admin-signs-in");
        form.findElement(By.cssSelector("button[type=submit]")).click();
        browser.await(d -> browser.byId("account").getText().contains("Ines Varga · admin"), "the admin signed in");
    }

    /** Each file of the folder with its size and time: anything written would change it. */
    private static Map<String, String> snapshot(Path folder) throws IOException {
        Map<String, String> files = new TreeMap<>();
        try (Stream<Path> all = Files.walk(folder)) {
            for (Path p : all.toList()) {
                files.put(folder.relativize(p).toString(), Files.isDirectory(p) ? "folder"
                        : Files.size(p) + " bytes, " + Files.getLastModifiedTime(p));
            }
        }
        return files;
    }

    /** Runs the command line in a process of its own, as a person would, and waits for it. */
    private Run run(String... args) throws IOException, InterruptedException {
        Process p = command(args).start();
        String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        String err = new String(p.getErrorStream().readAllBytes(), StandardCharsets.UTF_8);
        assertTrue(p.waitFor(60, TimeUnit.SECONDS), "dowser " + String.join(" ", args) + " ends");
        return new Run(p.exitValue(), out, err);
    }

    private ProcessBuilder command(String... args) {
        List<String> cmd = new ArrayList<>(List.of(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                "-cp", System.getProperty("java.class.path"), "dev.dowser.cli.Main"));
        cmd.addAll(List.of(args));
        return new ProcessBuilder(cmd).directory(dir.toFile());
    }

    /**
     * The first group of the first line of the process's output that matches, within 60 s. A thread
     * of its own reads the output to the end (so a blocking read cannot outlast the deadline, and
     * the process never blocks on a full pipe).
     */
    private static String awaitLine(Process p, Pattern line) {
        List<String> printed = new CopyOnWriteArrayList<>();
        Thread reader = new Thread(() -> {
            BufferedReader out = new BufferedReader(new InputStreamReader(p.getInputStream(), StandardCharsets.UTF_8));
            try {
                for (String l = out.readLine(); l != null; l = out.readLine()) {
                    printed.add(l);
                }
            } catch (IOException ended) {
                // The process ended.
            }
        }, "server-stdout");
        reader.setDaemon(true);
        reader.start();
        TestSupport.await(Duration.ofSeconds(60), () -> firstMatch(printed, line) != null,
                "the server to print a line like " + line);
        return firstMatch(printed, line);
    }

    private static String firstMatch(List<String> lines, Pattern line) {
        for (String l : lines) {
            Matcher m = line.matcher(l);
            if (m.find()) {
                return m.group(1);
            }
        }
        return null;
    }
}
