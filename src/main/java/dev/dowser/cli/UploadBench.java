package dev.dowser.cli;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.json.Json;
import dev.dowser.store.Database;
import dev.dowser.team.Accounts;
import dev.dowser.team.Caller;
import dev.dowser.team.Role;
import dev.dowser.team.TeamConfig;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.Writer;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.SecureRandom;
import java.time.Clock;
import java.time.Duration;
import java.util.SplittableRandom;

/**
 * Issue 14: a 1 GiB upload into a server started with {@code -Xmx512m}. The server runs as its own
 * process; a generated CSV (an id, eight readings, a condition on one row in a hundred) is sent
 * through the API with its length, spooled to disk as it arrives, then imported. Prints the upload's
 * and the import's seconds, and the server's peak resident memory (Linux's VmHWM), which a file
 * held in memory would push past the heap.
 */
final class UploadBench {

    static final long FULL_BYTES = 1L << 30;
    static final long QUICK_BYTES = 128L << 20;
    static final String HEAP = "-Xmx512m";

    private UploadBench() {
    }

    static void run(PrintWriter out, Path dir, boolean quick) throws Exception {
        Path data = dir.resolve("data");
        String token;
        try (Database db = Database.open(data, Clock.systemUTC())) {
            Accounts accounts = new Accounts(db, new SecureRandom(), TeamConfig.defaults().withIterations(1_000));
            accounts.add("bench", Role.ADMIN, "bench password " + System.nanoTime(), "bench");
            token = accounts.newToken(new Caller("bench", Role.ADMIN, null, null), "upload bench");
        }
        Path csv = dir.resolve("readings.csv");
        long rows = write(csv, quick ? QUICK_BYTES : FULL_BYTES);
        long bytes = Files.size(csv);
        out.printf("upload_heap=%s%nupload_bytes=%d%nupload_rows=%d%n", HEAP, bytes, rows);
        out.flush();
        HttpClient http = HttpClient.newHttpClient();
        try (ServerProcess server = ServerProcess.start(ServerProcess.sameJava(HEAP), data, dir.resolve("server.log"))) {
            String base = "http://127.0.0.1:" + server.port() + "/api/v1/";
            long started = System.nanoTime();
            HttpResponse<String> sent = http.send(HttpRequest.newBuilder(URI.create(base
                            + "imports?pool=readings&file_name=readings.csv&id=id&label=condition"))
                    .header("Authorization", "Bearer " + token).POST(HttpRequest.BodyPublishers.ofFile(csv)).build(),
                    HttpResponse.BodyHandlers.ofString());
            double uploadSeconds = (System.nanoTime() - started) / 1e9;
            if (sent.statusCode() != 202) {
                throw new IllegalStateException("the upload answered " + sent.statusCode() + ": " + sent.body());
            }
            String job = base + "imports/" + Json.tree(sent.body()).get("id").asText();
            JsonNode status;
            do {
                Thread.sleep(1_000);
                status = Json.tree(http.send(HttpRequest.newBuilder(URI.create(job)).header("Authorization", "Bearer " + token)
                        .timeout(Duration.ofSeconds(60)).build(), HttpResponse.BodyHandlers.ofString()).body());
            } while (status.get("state").asText().equals("queued") || status.get("state").asText().equals("running"));
            double totalSeconds = (System.nanoTime() - started) / 1e9;
            out.printf("upload_state=%s%nupload_records=%d%nupload_send_seconds=%.1f%nupload_import_seconds=%.1f%n"
                            + "upload_total_seconds=%.1f%nupload_server_peak_rss_mib=%s%n",
                    status.get("state").asText(), status.path("records").asLong(), uploadSeconds,
                    status.at("/result/seconds").asDouble(Double.NaN), totalSeconds, peakRssMib(server.pid()));
            if (!status.path("error").isNull()) {
                out.println("upload_error=" + status.get("error").asText());
            }
            out.flush();
            // The first round the server starts by itself for the new pool: how it ended, and why.
            JsonNode round = Json.object();
            long deadline = System.nanoTime() + Duration.ofMinutes(10).toNanos();
            while (System.nanoTime() < deadline) {
                JsonNode rounds = Json.tree(http.send(HttpRequest.newBuilder(URI.create(base + "pools/readings/rounds"))
                        .header("Authorization", "Bearer " + token).timeout(Duration.ofSeconds(60)).build(),
                        HttpResponse.BodyHandlers.ofString()).body()).path("rounds");
                round = rounds.isEmpty() ? Json.object() : rounds.get(rounds.size() - 1);
                if (!round.path("status").asText("running").equals("running")) {
                    break;
                }
                Thread.sleep(1_000);
            }
            out.printf("upload_first_round=%s%nupload_first_round_message=%s%nupload_server_peak_rss_after_round_mib=%s%n",
                    round.path("status").asText("none"), round.path("message").asText(""), peakRssMib(server.pid()));
            out.flush();
        } finally {
            Files.deleteIfExists(csv);
        }
    }

    /** Rows of the generated file until it holds {@code bytes} bytes or a little more. */
    private static long write(Path file, long bytes) throws IOException {
        SplittableRandom rng = new SplittableRandom(BenchCommand.SEED);
        String[] conditions = {"healthy", "imbalance", "cavitation"};
        long size = 0;
        long rows = 0;
        try (Writer w = Files.newBufferedWriter(file, StandardCharsets.US_ASCII)) {
            StringBuilder line = new StringBuilder(128).append("id,r0,r1,r2,r3,r4,r5,r6,r7,condition\n");
            while (size < bytes) {
                w.write(line.toString());
                size += line.length();
                line.setLength(0);
                line.append("reading-").append(rows++);
                for (int f = 0; f < 8; f++) {
                    line.append(',');
                    BenchCommand.appendFixed4(line, rng.nextGaussian() * 3);
                }
                line.append(',').append(rows % 100 == 0 ? conditions[rng.nextInt(3)] : "").append('\n');
            }
        }
        return rows - 1;
    }

    /** The process's peak resident memory from /proc (Linux), or n/a. */
    private static String peakRssMib(long pid) {
        try {
            for (String l : Files.readAllLines(Path.of("/proc", Long.toString(pid), "status"))) {
                if (l.startsWith("VmHWM:")) {
                    return Long.toString(Long.parseLong(l.replaceAll("[^0-9]", "")) >> 10);
                }
            }
        } catch (IOException | RuntimeException e) {
            return "n/a";
        }
        return "n/a";
    }
}
