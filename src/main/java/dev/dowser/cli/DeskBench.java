package dev.dowser.cli;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.data.FileFormat;
import dev.dowser.data.ImportProgress;
import dev.dowser.data.ImportSpec;
import dev.dowser.data.Importer;
import dev.dowser.json.Json;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Strategy;
import dev.dowser.store.Database;
import dev.dowser.team.Accounts;
import dev.dowser.team.Caller;
import dev.dowser.team.Role;
import dev.dowser.team.TeamConfig;
import dev.dowser.web.WebConfig;
import dev.dowser.web.WebServer;
import java.io.IOException;
import java.io.InputStream;
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
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;

/**
 * The desk under load, on loopback: simulated labellers each submit a label and ask for the next
 * record, over and over, while rounds run on a 100,000-row pool (64 features, 10 classes, 1000
 * labels to start). Reports the latency of submit-and-next and, for each round the labels start,
 * the time from the batch's last label to the new queue being served.
 */
final class DeskBench {

    static final int POOL = 100_000;
    static final int FEATURES = BenchCommand.FEATURES;
    static final int CLASSES = 10;
    static final int LABELLED = 1_000;
    static final int LABELLERS = 20;
    /** Labels per round here: with 20 people a batch of 10 would leave them waiting on rounds most of the time. */
    static final int BATCH = 100;
    /** Pause between a labeller's records; a person takes seconds, so this is many times the real load. */
    static final int THINK_MILLIS = 200;

    private DeskBench() {
    }

    static void run(PrintWriter out, Path dir, boolean quick) throws Exception {
        Path csv = dir.resolve("desk.csv");
        writePool(csv);
        try (Database db = Database.open(dir.resolve("db"), Clock.systemUTC())) {
            try (InputStream in = Files.newInputStream(csv)) {
                new Importer(db).run(in, "desk.csv", ImportSpec.defaults("desk", FileFormat.CSV).withId("id").withLabel("label"),
                        ImportProgress.NONE);
            }
            long poolId = db.pools().require("desk").id();
            db.pools().updateSettings(poolId, new PoolSettings(BATCH, PoolSettings.DEFAULT_SPOT_CHECK_SHARE,
                    PoolSettings.DEFAULT_LEASE_MINUTES, Strategy.BALD, PoolSettings.DEFAULT_DOUBLE_LABEL_SHARE).toJson(), "bench");
            try (WebServer server = WebServer.start(db, new WebConfig("127.0.0.1", 0, 1 << 20, dir.resolve("up")))) {
                server.requestRound("desk");
                while (db.queues().servedRound(poolId).isEmpty()) {
                    Thread.sleep(20);
                }
                measure(out, server.port(), labellerTokens(db), quick ? 15 : 60);
            }
        }
    }

    /**
     * One labeller account and API token per simulated person. Their passwords are never used, so
     * they are hashed with few iterations to keep the set-up short.
     */
    private static List<String> labellerTokens(Database db) {
        Accounts accounts = new Accounts(db, new SecureRandom(), TeamConfig.defaults().withIterations(1_000));
        List<String> tokens = new ArrayList<>();
        for (int p = 0; p < LABELLERS; p++) {
            String name = "bench-" + p;
            accounts.add(name, Role.LABELLER, UsersCommand.generatePassword(new SecureRandom()), "bench");
            tokens.add(accounts.newToken(new Caller(name, Role.LABELLER, null, null), "bench"));
        }
        return tokens;
    }

    private static void measure(PrintWriter out, int port, List<String> tokens, int seconds) throws Exception {
        HttpClient http = HttpClient.newBuilder().executor(Executors.newFixedThreadPool(4)).build();
        long end = System.nanoTime() + seconds * 1_000_000_000L;
        List<long[]> perThread = new ArrayList<>();
        List<double[]> turnarounds = new ArrayList<>();
        ExecutorService people = Executors.newFixedThreadPool(LABELLERS);
        List<Future<?>> done = new ArrayList<>();
        for (int p = 0; p < LABELLERS; p++) {
            long[] times = new long[200_000];
            perThread.add(times);
            String token = tokens.get(p);
            done.add(people.submit(() -> labeller(http, port, token, end, times, turnarounds)));
        }
        for (Future<?> f : done) {
            f.get();
        }
        people.shutdown();
        people.awaitTermination(10, TimeUnit.SECONDS);
        long[] all = perThread.stream().flatMapToLong(t -> Arrays.stream(t).filter(v -> v > 0)).sorted().toArray();
        double[] turn;
        synchronized (turnarounds) {
            turn = turnarounds.stream().mapToDouble(t -> t[0]).sorted().toArray();
        }
        out.printf("desk_labellers=%d%ndesk_batch=%d%ndesk_submit_and_next=%d%n", LABELLERS, BATCH, all.length);
        out.printf("desk_submit_and_next_p50_ms=%.1f%ndesk_submit_and_next_p99_ms=%.1f%ndesk_submit_and_next_max_ms=%.1f%n",
                quantile(all, 0.5) / 1e6, quantile(all, 0.99) / 1e6, all.length == 0 ? 0 : all[all.length - 1] / 1e6);
        out.printf("desk_rounds_seen=%d%n", turn.length);
        if (turn.length > 0) {
            out.printf("desk_last_label_to_new_queue_median_s=%.2f%ndesk_last_label_to_new_queue_max_s=%.2f%n",
                    turn[turn.length / 2], turn[turn.length - 1]);
        }
        out.flush();
    }

    /**
     * One simulated person: label the held record (a class chosen at random), ask for the next,
     * think, repeat. A reply that says the batch is complete starts a clock, stopped by the first
     * reply that shows a newer round served.
     */
    private static void labeller(HttpClient http, int port, String token, long end, long[] times,
                                 List<double[]> turnarounds) {
        SplittableRandom rng = new SplittableRandom(token.hashCode());
        String base = "http://127.0.0.1:" + port + "/api/v1/pools/desk/";
        int n = 0;
        long batchDoneAt = 0;
        int roundWhenDone = 0;
        try {
            JsonNode held = post(http, token, base + "queue/next", "{}");
            while (System.nanoTime() < end && n < times.length) {
                long t0 = System.nanoTime();
                JsonNode progress;
                if (held.hasNonNull("record")) {
                    JsonNode labelled = post(http, token, base + "labels", "{\"record\":\""
                            + held.at("/record/id").asText() + "\",\"label\":\"c" + rng.nextInt(CLASSES) + "\"}");
                    progress = labelled.get("progress");
                    if (progress.get("labels_to_next_round").asInt() == BATCH && batchDoneAt == 0) {
                        batchDoneAt = System.nanoTime();
                        roundWhenDone = progress.path("served_round").asInt();
                    }
                }
                held = post(http, token, base + "queue/next", "{}");
                times[n++] = System.nanoTime() - t0;
                int served = held.at("/progress/served_round").asInt();
                if (batchDoneAt != 0 && served > roundWhenDone) {
                    synchronized (turnarounds) {
                        turnarounds.add(new double[] {(System.nanoTime() - batchDoneAt) / 1e9});
                    }
                    batchDoneAt = 0;
                }
                Thread.sleep(held.hasNonNull("record") ? THINK_MILLIS : 50);
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        } catch (IOException e) {
            throw new IllegalStateException("a simulated labeller failed: " + e.getMessage(), e);
        }
    }

    private static JsonNode post(HttpClient http, String token, String url, String body)
            throws IOException, InterruptedException {
        HttpResponse<String> r = http.send(HttpRequest.newBuilder(URI.create(url)).header("Authorization", "Bearer " + token)
                .POST(HttpRequest.BodyPublishers.ofString(body)).build(), HttpResponse.BodyHandlers.ofString());
        if (r.statusCode() >= 300) {
            throw new IOException("HTTP " + r.statusCode() + " from " + url + ": " + r.body());
        }
        return Json.tree(r.body());
    }

    private static double quantile(long[] sorted, double q) {
        return sorted.length == 0 ? 0 : sorted[(int) Math.min(sorted.length - 1, Math.floor(q * sorted.length))];
    }

    /** Rows of 64 Gaussian features; the first 1000 carry the class of a fixed linear rule, the rest none. */
    private static void writePool(Path file) throws IOException {
        SplittableRandom rng = new SplittableRandom(BenchCommand.SEED);
        try (Writer w = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
            StringBuilder line = BenchCommand.header(new StringBuilder(1024));
            w.write(line.append(",label\n").toString());
            double[] x = new double[FEATURES];
            for (int i = 0; i < POOL; i++) {
                line.setLength(0);
                line.append('r').append(i);
                for (int f = 0; f < FEATURES; f++) {
                    x[f] = rng.nextGaussian();
                    line.append(',');
                    BenchCommand.appendFixed4(line, x[f]);
                }
                line.append(',');
                if (i < LABELLED) {
                    int best = 0;
                    for (int c = 1; c < CLASSES; c++) {
                        if (x[c] + 0.5 * x[c + CLASSES] > x[best] + 0.5 * x[best + CLASSES]) {
                            best = c;
                        }
                    }
                    line.append('c').append(best);
                }
                w.write(line.append('\n').toString());
            }
        }
    }
}
