package dev.dowser.cli;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.data.FileFormat;
import dev.dowser.data.ImportProgress;
import dev.dowser.data.ImportSpec;
import dev.dowser.data.Importer;
import dev.dowser.json.Json;
import dev.dowser.acquire.PoolScorer;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.RoundService;
import dev.dowser.rounds.Strategy;
import dev.dowser.sampler.SamplerConfig;
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
import java.util.concurrent.atomic.AtomicLong;
import java.util.stream.Stream;

/**
 * The desk under load, on loopback: simulated labellers each submit a label and ask for the next
 * record, over and over, while rounds run on a 100,000-row pool (64 features, 10 classes, 1000
 * labels to start). Every phase starts from a copy of the same prepared database.
 * <ul>
 * <li>What durable commits cost: 20 labellers, batch 100, with commits written before they return
 * (as served) and delayed (H2's default), in the order written, delayed, delayed, written so that
 * neither gets the warm-up alone; the latency of submit-and-next, and for each round the labels
 * start, the time from the batch's last label to the new queue being served.</li>
 * <li>Whether the desk ever waits: 1 labeller on the default settings, 20 on the defaults, 20
 * with BatchBALD at 20 a round, and a crowd of 50 on the defaults; the count of answers with no
 * record while the pool still has thousands unlabelled (any such answer is an empty desk).</li>
 * </ul>
 */
final class DeskBench {

    static final int POOL = 100_000;
    static final int FEATURES = BenchCommand.FEATURES;
    static final int CLASSES = 10;
    static final int LABELLED = 1_000;
    static final int LABELLERS = 20;
    /** The crowd of issue 11's load test, where half the desk's answers were empty. */
    static final int CROWD = 50;
    /** Labels per round in the commit phases: the batch size a team of 20 would choose. */
    static final int BATCH = 100;
    /** Pause between a labeller's records; a person takes seconds, so this is many times the real load. */
    static final int THINK_MILLIS = 200;
    /** Pause after an empty answer before asking again. */
    static final int RETRY_MILLIS = 50;

    private DeskBench() {
    }

    /** One phase: how commits reach the file, how many label, with which settings, for how long. */
    private record Phase(String tag, Database.Commits commits, int labellers, PoolSettings settings, int seconds) {
    }

    /** What a phase measured: submit-and-next latencies (ns, sorted), answers, empty answers, round turnarounds (s). */
    private record Result(long[] latencies, long answers, long empty, double[] turnarounds) {
    }

    static void run(PrintWriter out, Path dir, boolean quick) throws Exception {
        Path csv = dir.resolve("desk.csv");
        writePool(csv);
        Path seeded = dir.resolve("seeded");
        List<String> tokens;
        try (Database db = Database.open(seeded, Clock.systemUTC())) {
            try (InputStream in = Files.newInputStream(csv)) {
                new Importer(db).run(in, "desk.csv", ImportSpec.defaults("desk", FileFormat.CSV).withId("id")
                        .withLabel("label"), ImportProgress.NONE);
            }
            tokens = labellerTokens(db);
            // One round here, so that each phase's rounds continue saved chains, as a server that has run a while does.
            try (PoolScorer scorer = PoolScorer.withAllCores()) {
                RoundService.Outcome first = new RoundService(db, SamplerConfig.defaults(), scorer)
                        .run("desk");
                if (!first.published()) {
                    throw new IllegalStateException("the desk benchmark's first round failed: " + first.message());
                }
            }
        }
        int seconds = quick ? 8 : 15;
        PoolSettings team = settings(BATCH, Strategy.BALD);
        List<Result> written = new ArrayList<>();
        List<Result> delayed = new ArrayList<>();
        for (Database.Commits commits : List.of(Database.Commits.WRITTEN, Database.Commits.DELAYED,
                Database.Commits.DELAYED, Database.Commits.WRITTEN)) {
            Result r = phase(dir, seeded, tokens, new Phase(commits.name().toLowerCase(java.util.Locale.ROOT), commits,
                    LABELLERS, team, seconds));
            (commits == Database.Commits.WRITTEN ? written : delayed).add(r);
        }
        out.printf("desk_labellers=%d%ndesk_batch=%d%ndesk_phase_seconds=%d%n", LABELLERS, BATCH, seconds);
        Result w = merge(written);
        Result d = merge(delayed);
        print(out, "desk_written", w);
        print(out, "desk_delayed", d);
        out.printf("desk_written_to_delayed_p50=%.2f%ndesk_written_to_delayed_p99=%.2f%n",
                quantile(w.latencies(), 0.5) / quantile(d.latencies(), 0.5),
                quantile(w.latencies(), 0.99) / quantile(d.latencies(), 0.99));
        out.flush();
        int emptySeconds = quick ? 10 : 20;
        for (Phase p : List.of(new Phase("one_default", Database.Commits.WRITTEN, 1, PoolSettings.defaults(), emptySeconds),
                new Phase("twenty_default", Database.Commits.WRITTEN, LABELLERS, PoolSettings.defaults(), emptySeconds),
                new Phase("twenty_batchbald20", Database.Commits.WRITTEN, LABELLERS, settings(20, Strategy.BATCHBALD),
                        emptySeconds),
                new Phase("fifty_default", Database.Commits.WRITTEN, CROWD, PoolSettings.defaults(), emptySeconds))) {
            Result r = phase(dir, seeded, tokens, p);
            out.printf("desk_empty_%s=%d%ndesk_answers_%s=%d%ndesk_rounds_%s=%d%n"
                    + "desk_%s_submit_and_next_p50_ms=%.1f%ndesk_%s_submit_and_next_p99_ms=%.1f%n", p.tag(), r.empty(),
                    p.tag(), r.answers(), p.tag(), r.turnarounds().length, p.tag(), quantile(r.latencies(), 0.5) / 1e6,
                    p.tag(), quantile(r.latencies(), 0.99) / 1e6);
            out.flush();
        }
    }

    private static PoolSettings settings(int batch, Strategy strategy) {
        return new PoolSettings(batch, PoolSettings.DEFAULT_SPOT_CHECK_SHARE, PoolSettings.DEFAULT_LEASE_MINUTES,
                strategy, PoolSettings.DEFAULT_DOUBLE_LABEL_SHARE);
    }

    private static void print(PrintWriter out, String tag, Result r) {
        long[] all = r.latencies();
        double[] turn = r.turnarounds();
        out.printf("%s_submit_and_next=%d%n%s_submit_and_next_p50_ms=%.1f%n%s_submit_and_next_p99_ms=%.1f%n"
                        + "%s_submit_and_next_max_ms=%.1f%n%s_empty=%d%n%s_rounds_seen=%d%n", tag, all.length,
                tag, quantile(all, 0.5) / 1e6, tag, quantile(all, 0.99) / 1e6, tag,
                all.length == 0 ? 0 : all[all.length - 1] / 1e6, tag, r.empty(), tag, turn.length);
        if (turn.length > 0) {
            out.printf("%s_last_label_to_new_queue_median_s=%.2f%n%s_last_label_to_new_queue_max_s=%.2f%n",
                    tag, turn[turn.length / 2], tag, turn[turn.length - 1]);
        }
    }

    private static Result merge(List<Result> parts) {
        return new Result(parts.stream().flatMapToLong(r -> Arrays.stream(r.latencies())).sorted().toArray(),
                parts.stream().mapToLong(Result::answers).sum(), parts.stream().mapToLong(Result::empty).sum(),
                parts.stream().flatMapToDouble(r -> Arrays.stream(r.turnarounds())).sorted().toArray());
    }

    /** Runs one phase on a fresh copy of the prepared database, then deletes the copy. */
    private static Result phase(Path dir, Path seeded, List<String> tokens, Phase phase) throws Exception {
        Path copy = dir.resolve("phase-" + phase.tag());
        copyTree(seeded, copy);
        try (Database db = Database.open(copy, Clock.systemUTC(), phase.commits())) {
            long poolId = db.pools().require("desk").id();
            db.pools().updateSettings(poolId, phase.settings().toJson(), "bench");
            try (WebServer server = WebServer.start(db, new WebConfig("127.0.0.1", 0, 1 << 20, copy.resolve("up")))) {
                server.requestRound("desk");
                long deadline = System.nanoTime() + TimeUnit.MINUTES.toNanos(5);
                while (db.queues().servedRound(poolId).isEmpty()) {
                    if (System.nanoTime() > deadline) {
                        throw new IllegalStateException("the first round of the desk benchmark took over 5 minutes");
                    }
                    Thread.sleep(20);
                }
                // Steady state: the pool's id index (built at start, in the background) is ready before the clock runs.
                db.records().warmKeys(poolId);
                return measure(server.port(), tokens.subList(0, phase.labellers()), phase.settings().batchSize(),
                        phase.seconds());
            }
        } finally {
            Folders.deleteTree(copy);
        }
    }

    private static void copyTree(Path from, Path to) throws IOException {
        try (Stream<Path> paths = Files.walk(from)) {
            for (Path p : paths.toList()) {
                Files.copy(p, to.resolve(from.relativize(p).toString()));
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
        for (int p = 0; p < CROWD; p++) {
            String name = "bench-" + p;
            accounts.add(name, Role.LABELLER, UsersCommand.generatePassword(new SecureRandom()), "bench");
            tokens.add(accounts.newToken(new Caller(name, Role.LABELLER, null, null), "bench"));
        }
        return tokens;
    }

    private static Result measure(int port, List<String> tokens, int batch, int seconds) throws Exception {
        HttpClient http = HttpClient.newBuilder().executor(Executors.newFixedThreadPool(4)).build();
        long end = System.nanoTime() + seconds * 1_000_000_000L;
        List<long[]> perThread = new ArrayList<>();
        List<double[]> turnarounds = new ArrayList<>();
        AtomicLong answers = new AtomicLong();
        AtomicLong empty = new AtomicLong();
        ExecutorService people = Executors.newFixedThreadPool(tokens.size());
        List<Future<?>> done = new ArrayList<>();
        for (String token : tokens) {
            long[] times = new long[200_000];
            perThread.add(times);
            done.add(people.submit(() -> labeller(http, port, token, batch, end, times, turnarounds, answers, empty)));
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
        return new Result(all, answers.get(), empty.get(), turn);
    }

    /**
     * One simulated person: label the held record (a class chosen at random), ask for the next,
     * think, repeat. A reply that says the batch is complete starts a clock, stopped by the first
     * reply that shows a newer round served.
     */
    private static void labeller(HttpClient http, int port, String token, int batch, long end, long[] times,
                                 List<double[]> turnarounds, AtomicLong answers, AtomicLong empty) {
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
                    if (progress.get("labels_to_next_round").asInt() == batch && batchDoneAt == 0) {
                        batchDoneAt = System.nanoTime();
                        roundWhenDone = progress.path("served_round").asInt();
                    }
                }
                held = post(http, token, base + "queue/next", "{}");
                times[n++] = System.nanoTime() - t0;
                answers.incrementAndGet();
                if (!held.hasNonNull("record")) {
                    empty.incrementAndGet();
                }
                int served = held.at("/progress/served_round").asInt();
                if (batchDoneAt != 0 && served > roundWhenDone) {
                    synchronized (turnarounds) {
                        turnarounds.add(new double[] {(System.nanoTime() - batchDoneAt) / 1e9});
                    }
                    batchDoneAt = 0;
                }
                Thread.sleep(held.hasNonNull("record") ? THINK_MILLIS : RETRY_MILLIS);
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
