package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.TestSupport;
import dev.dowser.json.Json;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.store.Database;
import dev.dowser.team.Role;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.Statement;
import java.time.Clock;
import java.time.Duration;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.atomic.AtomicInteger;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Twenty people at the desk at once while rounds publish (issue 11): the real server on loopback,
 * the H2 file database, real HTTP. Each person asks for a record, labels it (or now and then skips
 * or takes a label back) and asks again, as fast as they can, while the pool's rounds keep
 * replacing the queue and a reviewer asks for more rounds. Afterwards: no record was in two
 * people's hands at once, no round queued a record twice, nobody labelled a record more often than
 * its queue place asked for, and no desk came back empty while the pool had records left.
 */
class DeskUnderLoadTest {

    static final int PEOPLE = 20;
    static final int RECORDS = 3_000;
    static final Duration LOAD = Duration.ofSeconds(12);

    @TempDir
    Path dir;

    /**
     * One record in one person's hands, from the reply that gave it to the request that gave it back;
     * {@code record} is its id, then {@code @round/position} of the place it was given from.
     */
    record Held(String person, String record, long from, long to) {
    }

    @Test
    void noRecordIsInTwoHandsAndNoQueueHoldsARecordTwice() throws Exception {
        List<String> tokens = new ArrayList<>();
        String lead;
        try (Database db = Database.open(dir.resolve("db"), Clock.systemUTC())) {
            StringBuilder csv = new StringBuilder("id,a,b,c\n");
            SplittableRandom rng = new SplittableRandom(5);
            for (int i = 0; i < RECORDS; i++) {
                csv.append('r').append(i).append(',').append(rng.nextGaussian()).append(',').append(rng.nextGaussian())
                        .append(',').append(rng.nextGaussian()).append('\n');
            }
            TestSupport.importText(db, "busy", csv.toString(), TestSupport.csv("busy").withId("id")
                    .withClasses(List.of("x", "y", "z")));
            // Batches of 10 with a fifth of each sent to two people: many rounds, many pairs.
            db.pools().updateSettings(db.pools().require("busy").id(), new PoolSettings(10, 0.1, 10,
                    PoolSettings.DEFAULT_STRATEGY, 0.2).toJson(), "test");
            lead = TestSupport.tokenFor(db, "lead", Role.REVIEWER);
            for (int p = 0; p < PEOPLE; p++) {
                tokens.add(TestSupport.tokenFor(db, "p" + p, Role.LABELLER));
            }
        }
        List<Held> held = Collections.synchronizedList(new ArrayList<>());
        AtomicInteger empty = new AtomicInteger();
        AtomicInteger labelled = new AtomicInteger();
        Database db = Database.open(dir.resolve("db"), Clock.systemUTC());
        try (WebServer server = WebServer.start(db, new WebConfig("127.0.0.1", 0, 1 << 20, dir.resolve("up")),
                TestSupport.quickSampler(), TestSupport.FAST_TEAM)) {
            long pool = db.pools().require("busy").id();
            TestSupport.await(Duration.ofSeconds(60), () -> db.queues().servedRound(pool).isPresent(),
                    "the first batch, served without anyone asking");
            HttpClient http = HttpClient.newBuilder().executor(Executors.newFixedThreadPool(8)).build();
            String base = "http://127.0.0.1:" + server.port() + "/api/v1/pools/busy/";
            long end = System.nanoTime() + LOAD.toNanos();
            ExecutorService people = Executors.newFixedThreadPool(PEOPLE + 1);
            List<Future<?>> done = new ArrayList<>();
            for (int p = 0; p < PEOPLE; p++) {
                String token = tokens.get(p);
                String person = "p" + p;
                SplittableRandom own = new SplittableRandom(p);
                done.add(people.submit(() -> {
                    while (System.nanoTime() < end) {
                        JsonNode next = post(http, token, base + "queue/next", "{}", 200);
                        long from = System.nanoTime();
                        if (!next.hasNonNull("record")) {
                            empty.incrementAndGet();
                            continue;
                        }
                        String id = next.at("/record/id").asText();
                        String record = id + "@" + next.get("round").asInt() + "/" + next.get("position").asInt();
                        if (own.nextDouble() < 0.1) {
                            held.add(new Held(person, record, from, System.nanoTime()));
                            post(http, token, base + "queue/skip", "{\"round\":" + next.get("round").asInt()
                                    + ",\"position\":" + next.get("position").asInt() + "}", 200);
                            continue;
                        }
                        held.add(new Held(person, record, from, System.nanoTime()));
                        post(http, token, base + "labels", "{\"record\":\"" + id + "\",\"label\":\"x\"}", 201);
                        labelled.incrementAndGet();
                        if (own.nextDouble() < 0.05) {
                            post(http, token, base + "labels/undo", "{\"record\":\"" + id + "\"}", 200);
                            // Taken back, the record comes back to this person unless someone else took it meanwhile.
                            JsonNode again = post(http, token, base + "queue/next", "{}", 200);
                            long back = System.nanoTime();
                            String record2 = again.at("/record/id").asText();
                            held.add(new Held(person, record2, back, System.nanoTime()));
                            post(http, token, base + "labels", "{\"record\":\"" + record2 + "\",\"label\":\"y\"}",
                                    201);
                        }
                    }
                    return null;
                }));
            }
            // A reviewer asks for rounds on top of those the desk starts, so queues are replaced all the time.
            done.add(people.submit(() -> {
                while (System.nanoTime() < end) {
                    post(http, lead, base + "rounds", "", 202);
                    Thread.sleep(300);
                }
                return null;
            }));
            for (Future<?> f : done) {
                f.get();
            }
            people.shutdown();
            int rounds = db.rounds().list(pool).size();
            // Slow on a busy machine, but never idle: every person labelled, queues were replaced under them.
            assertTrue(rounds >= 3, "only " + rounds + " rounds during the load");
            assertTrue(labelled.get() >= PEOPLE, "only " + labelled.get() + " labels given");
        } finally {
            db.close();
        }
        assertEquals(0, empty.get(), "empty desks while " + RECORDS + " records were mostly unlabelled");
        assertEquals(List.of(), overlaps(held), "a record in two people's hands at once");
        try (Connection c = java.sql.DriverManager.getConnection("jdbc:h2:file:"
                + dir.resolve("db").toAbsolutePath().resolve(Database.FILE_STEM), "dowser", "");
             Statement s = c.createStatement()) {
            assertEquals(List.of(), rows(s, "SELECT round_no, row_no, COUNT(*) FROM queue_entries"
                    + " GROUP BY round_no, row_no HAVING COUNT(*) > 1"), "a record queued twice in one round");
            // The labels in force (each person's newest label row of a record, unless it takes a label back):
            // never more people than the record's places asked for.
            assertEquals(List.of(), rows(s, "SELECT l.row_no, COUNT(*) FROM labels l WHERE NOT l.withdrawn"
                    + " AND NOT EXISTS (SELECT 1 FROM labels w WHERE w.row_no = l.row_no"
                    + " AND w.labelled_by = l.labelled_by AND w.id > l.id) GROUP BY l.row_no"
                    + " HAVING COUNT(*) > (SELECT MAX(q.copies) FROM queue_entries q WHERE q.row_no = l.row_no)"),
                    "a record labelled by more people than it was sent to");
        }
    }

    /** Pairs of holds of one record by two people whose times overlap. */
    static List<String> overlaps(List<Held> held) {
        java.util.Map<String, List<Held>> byRecord = new java.util.HashMap<>();
        for (Held h : held) {
            byRecord.computeIfAbsent(h.record().split("@")[0], r -> new ArrayList<>()).add(h);
        }
        List<String> out = new ArrayList<>();
        for (List<Held> hs : byRecord.values()) {
            for (int i = 0; i < hs.size(); i++) {
                for (int j = i + 1; j < hs.size(); j++) {
                    Held a = hs.get(i);
                    Held b = hs.get(j);
                    if (!a.person().equals(b.person()) && a.from() < b.to() && b.from() < a.to()) {
                        out.add(a + " and " + b);
                    }
                }
            }
        }
        return out;
    }

    private static List<String> rows(Statement s, String sql) throws Exception {
        List<String> out = new ArrayList<>();
        try (ResultSet rs = s.executeQuery(sql)) {
            while (rs.next()) {
                out.add(rs.getString(1) + "/" + rs.getString(2));
            }
        }
        return out;
    }

    private static JsonNode post(HttpClient http, String token, String url, String body, int expected)
            throws Exception {
        HttpResponse<String> r = http.send(HttpRequest.newBuilder(URI.create(url))
                .header("Authorization", "Bearer " + token).POST(HttpRequest.BodyPublishers.ofString(body)).build(),
                HttpResponse.BodyHandlers.ofString());
        if (r.statusCode() != expected) {
            throw new AssertionError(url + " answered " + r.statusCode() + ": " + r.body());
        }
        return Json.tree(r.body());
    }
}
