package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.json.Json;
import dev.dowser.store.Database;
import dev.dowser.team.Role;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.io.PrintStream;
import java.net.HttpURLConnection;
import java.net.Socket;
import java.net.SocketException;
import java.net.SocketTimeoutException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Slow and hostile clients on real sockets against the real server on a loopback port: bodies
 * sent a byte at a time, headers never finished, bodies far over the limit, bodies abandoned
 * halfway. None of them may hold up a signed-in person, none may be read into memory past its
 * limit, and each leaves at most one line in the log.
 */
class SlowClientsTest {

    /** The issue's own bound for a signed-in request while slow clients hang on (issue 11, item 4). */
    static final Duration SIGNED_IN_BOUND = Duration.ofSeconds(1);

    @TempDir
    Path dir;
    Database db;
    WebServer server;
    String token;
    final HttpClient http = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(5)).build();
    final List<Socket> sockets = new ArrayList<>();

    private void start(ClientLimits limits, long maxUploadBytes) {
        db = TestSupport.openDb(dir.resolve("db"));
        server = WebServer.start(db, new WebConfig("127.0.0.1", 0, maxUploadBytes, dir.resolve("uploads"))
                .withLimits(limits), TestSupport.quickSampler(), TestSupport.FAST_TEAM);
        token = TestSupport.tokenFor(db, "ana", Role.ADMIN);
    }

    @AfterEach
    void stop() throws IOException {
        for (Socket s : sockets) {
            s.close();
        }
        if (server != null) {
            server.close();
            db.close();
        }
    }

    /**
     * 50 connections each sending a sign-in body a byte at a time: a signed-in person's read and
     * write (with a JSON body) still answer in under a second (5-30 ms here when warm).
     */
    @Test
    void fiftySlowSignInsHoldUpNobody() throws Exception {
        start(ClientLimits.defaults(), 1 << 20);
        String body = "{\"name\":\"ana\",\"password\":\"" + "x".repeat(200) + "\"}";
        // Warm up first: the bound is on waiting behind slow clients, not on a cold start (which takes
        // more than 10 s on a loaded machine: the first request loads and compiles the whole chain).
        for (int i = 0; i < 3; i++) {
            http.send(signedIn("/api/v1/pools").timeout(Duration.ofSeconds(120)).build(),
                    HttpResponse.BodyHandlers.ofString());
        }
        for (int i = 0; i < 50; i++) {
            Socket s = open();
            send(s, "POST /api/v1/session HTTP/1.1\r\nHost: x\r\nContent-Type: application/json\r\nContent-Length: "
                    + body.length() + "\r\n\r\n" + body.charAt(0));
        }
        // Keep them trickling while a signed-in person works: reads and a write with a JSON body.
        Thread trickle = new Thread(() -> {
            try {
                for (int k = 1; k < 6; k++) {
                    for (Socket s : sockets) {
                        send(s, String.valueOf(body.charAt(k)));
                    }
                    Thread.sleep(300);
                }
            } catch (IOException | InterruptedException e) {
                // The test's own sockets closing ends this.
            }
        });
        trickle.setDaemon(true);
        trickle.start();
        List<Duration> took = new ArrayList<>();
        for (int i = 0; i < 10; i++) {
            long t0 = System.nanoTime();
            HttpResponse<String> pools = http.send(signedIn("/api/v1/pools").build(), HttpResponse.BodyHandlers.ofString());
            HttpResponse<String> made = http.send(signedIn("/api/v1/tokens").POST(HttpRequest.BodyPublishers.ofString(
                    "{\"name\":\"script " + i + "\"}")).build(), HttpResponse.BodyHandlers.ofString());
            took.add(Duration.ofNanos(System.nanoTime() - t0));
            assertEquals(200, pools.statusCode(), pools.body());
            assertEquals(201, made.statusCode(), made.body());
        }
        // The median, so that one pause of a shared machine (a collection, another build) is not taken
        // for a stall: a stall, as before, held every request for a minute.
        List<Duration> sorted = took.stream().sorted().toList();
        assertTrue(sorted.get(sorted.size() / 2).compareTo(SIGNED_IN_BOUND) < 0, "signed-in requests took " + took
                + " while 50 slow sign-ins hung on");
        trickle.interrupt();
        // The slow ones are still connected, still being read: nothing was closed to make room.
        for (Socket s : sockets) {
            assertTrue(!s.isClosed() && s.isConnected());
        }
    }

    /**
     * Past the cap on people not signed in, a new one is told to come back; signed-in people are not
     * counted. The test asks the door itself when the 8 slow bodies are in: probing with sign-ins
     * while they arrive (as it once did) let a probe take the eighth place on a loaded machine, and
     * the door never filled.
     */
    @Test
    void theDoorHoldsAFixedNumberOfStrangers() throws Exception {
        start(ClientLimits.defaults().withMaxAnonymousRequests(8).withBodyTimeouts(12_000, 30_000), 1 << 20);
        for (int i = 0; i < 8; i++) {
            send(open(), "POST /api/v1/session HTTP/1.1\r\nHost: x\r\nContent-Length: 100\r\n\r\n{");
        }
        TestSupport.await(Duration.ofSeconds(30), () -> server.strangersInside() == 8, "8 slow sign-ins inside the door");
        HttpResponse<String> refused = signIn();
        assertEquals(503, refused.statusCode(), refused.body());
        assertEquals("the server is serving 8 requests from people not signed in and takes no more for now;"
                + " try again in 2 s", Json.tree(refused.body()).get("error").asText());
        assertEquals("2", refused.headers().firstValue("retry-after").orElse(""));
        assertEquals(200, http.send(signedIn("/api/v1/pools").build(), HttpResponse.BodyHandlers.ofString())
                .statusCode());
        assertEquals(8, server.strangersInside(), "a signed-in request takes no place in the door");
        // The slow bodies miss their deadline and go; the door opens again.
        TestSupport.await(Duration.ofSeconds(60), () -> server.strangersInside() == 0, "the slow bodies to be cut off");
        assertEquals(401, signIn().statusCode());
    }

    /** A body that does not arrive in time ends its connection, with one line in the log and no stack trace. */
    @Test
    void aLateBodyIsCutOffWithOneLogLine() throws Exception {
        start(ClientLimits.defaults().withBodyTimeouts(500, 500), 1 << 20);
        Socket s = open();
        try (LogCapture log = new LogCapture()) {
            send(s, "POST /api/v1/session HTTP/1.1\r\nHost: x\r\nContent-Length: 40\r\n\r\n{\"na");
            s.setSoTimeout(10_000);
            assertTrue(closedByServer(s), "the server closed the connection");
            TestSupport.await(Duration.ofSeconds(5), () -> log.text().contains("did not arrive"), "the log line");
            assertEquals(1, log.lines().size(), log.text());
            assertTrue(log.text().contains("POST /api/v1/session from /127.0.0.1:"), log.text());
            assertTrue(log.text().matches("(?s).*the body did not arrive within 500 ms after \\d+ bytes of its"
                    + " body; the connection is closed.*"), log.text());
        }
    }

    /** A client that sends half a body and leaves is one line in the log, not a stack trace. */
    @Test
    void anAbandonedBodyIsOneLogLine() throws Exception {
        start(ClientLimits.defaults(), 1 << 20);
        try (LogCapture log = new LogCapture()) {
            for (String path : List.of("/api/v1/session", "/api/v1/tokens", "/api/v1/imports?pool=gone&classes=a,b")) {
                Socket s = open();
                send(s, "POST " + path + " HTTP/1.1\r\nHost: x\r\nAuthorization: Bearer " + token
                        + "\r\nContent-Length: 5000\r\n\r\n" + "a,b\n".repeat(100));
                s.close();
            }
            TestSupport.await(Duration.ofSeconds(10), () -> log.lines().size() >= 3, "three log lines");
            Thread.sleep(300);
            assertEquals(3, log.lines().size(), log.text());
            for (String line : log.lines()) {
                assertTrue(line.contains("the client stopped sending") && line.contains("after 400 bytes of its body"),
                        line);
            }
        }
        assertEquals(200, http.send(signedIn("/api/v1/pools").build(), HttpResponse.BodyHandlers.ofString())
                .statusCode());
    }

    /** Every route refuses a body declared over its limit with 413 naming the limit, before a byte of it is sent. */
    @Test
    void oversizedBodiesAreRefusedUnread() throws Exception {
        start(ClientLimits.defaults(), 1 << 20);
        Map<String, String> refusals = Map.of(
                "POST /api/v1/session", "the body of POST /api/v1/session may hold at most 16 KiB; nothing was read or changed",
                "POST /api/v1/tokens", "the body of POST /api/v1/tokens may hold at most 16 KiB; nothing was read or changed",
                "GET /api/v1/pools", "the body of GET /api/v1/pools may hold at most 16 KiB; nothing was read or changed",
                "POST /api/v1/previews", "the body of POST /api/v1/previews may hold at most 1 MiB; nothing was read or changed",
                "POST /api/v1/imports?pool=big", "the upload is 953.7 MiB, larger than the limit of 1 MiB (raise it with"
                        + " dowser serve --max-upload-mib); nothing was imported");
        for (var e : refusals.entrySet()) {
            Socket s = open();
            s.setSoTimeout(10_000);
            // A gigabyte announced, none of it sent: an answer can only come from the declared length.
            send(s, e.getKey() + " HTTP/1.1\r\nHost: x\r\nAuthorization: Bearer " + token
                    + "\r\nContent-Type: application/json\r\nContent-Length: 1000000000\r\n\r\n");
            String reply = readReply(s);
            assertTrue(reply.startsWith("HTTP/1.1 413 "), e.getKey() + ": " + reply);
            assertTrue(reply.contains("{\"error\":\"" + e.getValue() + "\"}"), e.getKey() + ": " + reply);
        }
        // A chunked body gives no length: it is cut off at the limit as it arrives.
        Socket s = open();
        s.setSoTimeout(10_000);
        send(s, "POST /api/v1/session HTTP/1.1\r\nHost: x\r\nTransfer-Encoding: chunked\r\n\r\n");
        String chunk = "x".repeat(4_096);
        for (int i = 0; i < 8; i++) {
            send(s, Integer.toHexString(chunk.length()) + "\r\n" + chunk + "\r\n");
        }
        send(s, "0\r\n\r\n");
        String reply = readReply(s);
        assertTrue(reply.startsWith("HTTP/1.1 413 "), reply);
        assertTrue(reply.contains("may hold at most 16 KiB"), reply);
    }

    /**
     * A chunked upload far past the limit (8 MiB sent, limit 1 MiB) gets its 413 and message: the
     * server answers at once, then reads on and drops the rest before closing, so that no reset takes
     * the answer away (curl reading from a pipe saw a reset instead, issues 11 and 14). Two clients:
     * the JDK's HttpClient, which reads while it sends, and HttpURLConnection, which sends the whole
     * body before it reads. The same for a JSON body. Nothing is imported.
     */
    @Test
    void chunkedBodiesFarPastTheLimitGetTheirRefusal() throws Exception {
        start(ClientLimits.defaults(), 1 << 20);
        String refusal = "the upload is larger than the limit of 1 MiB (raise it with dowser serve --max-upload-mib);"
                + " nothing was imported";
        String upload = "/api/v1/imports?pool=big&classes=a,b&wait=true";
        for (int i = 0; i < 2; i++) {
            HttpResponse<String> r = http.send(signedIn(upload).POST(HttpRequest.BodyPublishers.ofInputStream(
                    () -> lines(8L << 20))).build(), HttpResponse.BodyHandlers.ofString());
            assertEquals(413, r.statusCode(), r.body());
            assertEquals(refusal, Json.tree(r.body()).get("error").asText());
        }
        assertEquals(List.of(413, 413), List.of(sendWholeThenRead(upload, 8L << 20).status(),
                sendWholeThenRead(upload, 8L << 20).status()));
        assertEquals(refusal, Json.tree(sendWholeThenRead(upload, 8L << 20).body()).get("error").asText());
        Reply signIn = sendWholeThenRead("/api/v1/session", 8L << 20);
        assertEquals(413, signIn.status(), signIn.body());
        assertEquals("the body of POST /api/v1/session may hold at most 16 KiB; nothing was read or changed",
                Json.tree(signIn.body()).get("error").asText());
        HttpResponse<String> pools = http.send(signedIn("/api/v1/pools").build(), HttpResponse.BodyHandlers.ofString());
        assertEquals(0, Json.tree(pools.body()).get("pools").size(), pools.body());
    }

    private record Reply(int status, String body) {
    }

    /** POSTs {@code bytes} of CSV lines chunked, the whole body before reading the answer. */
    private Reply sendWholeThenRead(String path, long bytes) throws IOException {
        HttpURLConnection c = (HttpURLConnection) URI.create("http://127.0.0.1:" + server.port() + path).toURL()
                .openConnection();
        c.setRequestMethod("POST");
        c.setRequestProperty("Authorization", "Bearer " + token);
        c.setDoOutput(true);
        c.setChunkedStreamingMode(64 * 1024);
        c.setReadTimeout(30_000);
        try (OutputStream out = c.getOutputStream(); InputStream in = lines(bytes)) {
            in.transferTo(out);
        }
        int status = c.getResponseCode();
        try (InputStream in = status >= 400 ? c.getErrorStream() : c.getInputStream()) {
            return new Reply(status, new String(in.readAllBytes(), StandardCharsets.UTF_8));
        }
    }

    /** {@code bytes} of a two-column CSV made as it is read. */
    private static InputStream lines(long bytes) {
        byte[] line = "0.5,a\n".getBytes(StandardCharsets.US_ASCII);
        return new InputStream() {
            long at;

            @Override
            public int read() {
                return at < bytes ? line[(int) (at++ % line.length)] : -1;
            }

            @Override
            public int read(byte[] b, int off, int len) {
                if (at >= bytes) {
                    return -1;
                }
                int n = (int) Math.min(len, bytes - at);
                for (int i = 0; i < n; i++) {
                    b[off + i] = line[(int) (at++ % line.length)];
                }
                return n;
            }
        };
    }

    /** Headers that never end are cut off too, without a thread waiting on them. */
    @Test
    void unfinishedHeadersAreCutOff() throws Exception {
        start(new ClientLimits(500, 60_000, 10_000, 30_000, 60_000, 64, 2), 1 << 20);
        List<Socket> slow = new ArrayList<>();
        for (int i = 0; i < 20; i++) {
            Socket s = open();
            send(s, "GET /api/v1/pools HTTP/1.1\r\nHost: x\r\nX-Slow: ");
            slow.add(s);
        }
        assertEquals(200, http.send(signedIn("/api/v1/pools").build(), HttpResponse.BodyHandlers.ofString())
                .statusCode());
        for (Socket s : slow) {
            s.setSoTimeout(10_000);
            // Keep sending header bytes: only the header deadline can end it.
            assertTrue(closedByServer(s), "a connection whose headers never end is closed");
        }
    }

    private HttpResponse<String> signIn() throws IOException, InterruptedException {
        return http.send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + server.port() + "/api/v1/session"))
                .POST(HttpRequest.BodyPublishers.ofString("{\"name\":\"ana\",\"password\":\"wrong-password\"}"))
                .timeout(Duration.ofSeconds(10)).build(), HttpResponse.BodyHandlers.ofString());
    }

    private HttpRequest.Builder signedIn(String path) {
        return HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + server.port() + path))
                .header("Authorization", "Bearer " + token).timeout(Duration.ofSeconds(30));
    }

    private Socket open() throws IOException {
        Socket s = new Socket("127.0.0.1", server.port());
        sockets.add(s);
        return s;
    }

    private static void send(Socket s, String text) throws IOException {
        OutputStream out = s.getOutputStream();
        out.write(text.getBytes(StandardCharsets.UTF_8));
        out.flush();
    }

    /** The server's whole reply, up to its closing the connection or a pause. */
    private static String readReply(Socket s) throws IOException {
        ByteArrayOutputStream got = new ByteArrayOutputStream();
        InputStream in = s.getInputStream();
        byte[] buf = new byte[4096];
        try {
            int n;
            while ((n = in.read(buf)) > 0) {
                got.write(buf, 0, n);
                if (got.toString(StandardCharsets.UTF_8).contains("\"}")) {
                    break;
                }
            }
        } catch (SocketTimeoutException | SocketException e) {
            // What arrived is the reply.
        }
        return got.toString(StandardCharsets.UTF_8);
    }

    /** True when the server ends the connection while this side keeps trickling bytes (within the socket timeout). */
    private static boolean closedByServer(Socket s) throws IOException {
        long until = System.nanoTime() + Duration.ofSeconds(10).toNanos();
        s.setSoTimeout(200);
        while (System.nanoTime() < until) {
            try {
                if (s.getInputStream().read() < 0) {
                    return true;
                }
            } catch (SocketTimeoutException stillOpen) {
                try {
                    send(s, "x");
                } catch (SocketException closed) {
                    return true;
                }
            } catch (SocketException reset) {
                return true;
            }
        }
        return false;
    }

    /** Everything written to standard error (where the log goes) while it is open. */
    static final class LogCapture implements AutoCloseable {

        private final PrintStream original = System.err;
        private final ByteArrayOutputStream captured = new ByteArrayOutputStream();

        LogCapture() {
            System.setErr(new PrintStream(captured, true, StandardCharsets.UTF_8));
        }

        synchronized String text() {
            return captured.toString(StandardCharsets.UTF_8);
        }

        List<String> lines() {
            return text().lines().filter(l -> !l.isBlank()).toList();
        }

        @Override
        public void close() {
            System.setErr(original);
            original.print(text());
        }
    }
}
