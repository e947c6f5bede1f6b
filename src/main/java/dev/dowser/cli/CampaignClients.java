package dev.dowser.cli;

import static dev.dowser.cli.KillCampaign.ADMIN_PAUSE_MILLIS;
import static dev.dowser.cli.KillCampaign.CLASSES;
import static dev.dowser.cli.KillCampaign.POOL;
import static dev.dowser.cli.KillCampaign.REVIEW_PAUSE_MILLIS;
import static dev.dowser.cli.KillCampaign.UNDO_SHARE;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.json.Json;
import java.io.IOException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.net.http.HttpTimeoutException;
import java.time.Duration;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Queue;
import java.util.SplittableRandom;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.atomic.AtomicReference;

/**
 * The clients of one server life: labellers, a reviewer and an admin writing as fast as they can,
 * each acknowledged write put in the ledger. They work until a request fails to reach the server.
 */
final class CampaignClients {

    /** "Busy, try again": a lock not granted in time; nothing was written, and the client goes on. */
    static final int BUSY = 503;
    /** Pause before a request that did not reach the live server is sent again (see {@link #send}). */
    static final int RESEND_PAUSE_MILLIS = 100;
    /** How long a labeller waits before asking again when nothing was offered. */
    static final int EMPTY_PAUSE_MILLIS = 25;

    /**
     * What the desk answered over the whole campaign: records offered, and answers without one once
     * the first batch had been served (the pool always has unlabelled records left, so each is an
     * empty desk), with the first such answer's message.
     */
    static final class Desk {
        final AtomicLong offered = new AtomicLong();
        final AtomicLong empty = new AtomicLong();
        final AtomicReference<String> firstEmpty = new AtomicReference<>();
        /** Requests that did not reach the live server and were sent again. */
        final AtomicLong dropped = new AtomicLong();
    }

    private final HttpClient http = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(5)).build();
    private final String base;
    private final KillCampaign.Tokens tokens;
    private final Queue<String> members;
    private final AckLedger ledger;
    private final AtomicLong serverErrors;
    private final AtomicInteger settingsCounter;
    private final int cycle;
    private final SplittableRandom rng;
    private final AtomicLong busy;
    private final AtomicLong timeouts;
    private final Desk desk;
    private final AtomicBoolean down = new AtomicBoolean();
    private final AtomicBoolean killed = new AtomicBoolean();
    private volatile String firstStop;
    private final List<Thread> threads = new ArrayList<>();
    private final List<String> failures = Collections.synchronizedList(new ArrayList<>());

    CampaignClients(int port, KillCampaign.Tokens tokens, Queue<String> members, AckLedger ledger,
            AtomicLong serverErrors, AtomicLong busy, AtomicLong timeouts, Desk desk, AtomicInteger settingsCounter, int cycle, SplittableRandom rng) {
        this.base = "http://127.0.0.1:" + port + "/api/v1/";
        this.tokens = tokens;
        this.members = members;
        this.ledger = ledger;
        this.serverErrors = serverErrors;
        this.busy = busy;
        this.timeouts = timeouts;
        this.desk = desk;
        this.settingsCounter = settingsCounter;
        this.cycle = cycle;
        this.rng = rng;
    }

    void start(int labellers) {
        for (int i = 0; i < labellers; i++) {
            int who = i;
            SplittableRandom own = rng.split();
            threads.add(new Thread(() -> labeller(who, own), "labeller-" + i));
        }
        SplittableRandom own = rng.split();
        threads.add(new Thread(() -> reviewer(own), "reviewer"));
        threads.add(new Thread(this::admin, "admin"));
        threads.add(new Thread(this::addAccount, "accounts"));
        threads.forEach(t -> t.setUncaughtExceptionHandler((thread, e) -> {
            down.set(true);
            failures.add(thread.getName() + ": " + e);
        }));
        threads.forEach(Thread::start);
    }

    /** A client found the server gone (or a request failed): the life ends; why, in case it was early. */
    private void stopped(Exception e) {
        if (!down.getAndSet(true)) {
            firstStop = Thread.currentThread().getName() + ": " + e;
        }
    }

    /**
     * A request got no answer within its timeout: not acknowledged, so nothing to check, and the
     * client goes on (the server is slow, not gone; a password hash under heavy load takes long).
     */
    private void timedOut() {
        timeouts.incrementAndGet();
    }

    /** Why the first client stopped, or null. */
    String firstStop() {
        return firstStop;
    }

    /** The campaign is about to kill the server: from now on a request that fails ends its client. */
    void killing() {
        killed.set(true);
    }

    /** False once a client found the server gone or failed. */
    boolean working() {
        return !down.get();
    }

    void join() throws InterruptedException {
        for (Thread t : threads) {
            t.join(Duration.ofSeconds(60).toMillis());
            if (t.isAlive()) {
                throw new IllegalStateException(t.getName() + " still runs a minute after the server was killed");
            }
        }
        if (!failures.isEmpty()) {
            throw new IllegalStateException("a client failed: " + failures);
        }
    }

    /** One turn of a client: its requests for one step of its work. */
    @FunctionalInterface
    private interface Turn {
        void take() throws IOException, InterruptedException;
    }

    /**
     * Takes turns until the life ends, {@code pauseMillis} apart. A request that times out is counted
     * and the client goes on; one that finds the server gone ends the life, for every client.
     */
    private void turns(Turn turn, long pauseMillis) {
        try {
            while (!down.get()) {
                try {
                    turn.take();
                } catch (HttpTimeoutException slow) {
                    timedOut();
                }
                Thread.sleep(pauseMillis);
            }
        } catch (IOException | InterruptedException e) {
            stopped(e);
        }
    }

    private void labeller(int who, SplittableRandom rng) {
        String token = tokens.labellers().get(who);
        String person = tokens.labellerNames().get(who);
        String pool = "pools/" + POOL + "/";
        AtomicInteger n = new AtomicInteger();
        turns(() -> {
            HttpResponse<String> offered = send(token, "POST", pool + "queue/next", "{}");
            JsonNode next = offered.statusCode() == 200 ? Json.tree(offered.body()) : null;
            if (next == null || !next.hasNonNull("record")) {
                // Before the first batch of the campaign is served, nothing can be offered.
                if (next != null && desk.offered.get() > 0) {
                    desk.empty.incrementAndGet();
                    desk.firstEmpty.compareAndSet(null, "life " + (cycle + 1) + ": " + offered.body());
                }
                Thread.sleep(EMPTY_PAUSE_MILLIS);
                return;
            }
            desk.offered.incrementAndGet();
            String record = next.at("/record/id").asText();
            String label = CLASSES.get(rng.nextInt(CLASSES.size()));
            String note = "c" + cycle + "-" + person + "-" + n.getAndIncrement();
            HttpResponse<String> r = send(token, "POST", pool + "labels", Json.write(Json.object()
                    .put("record", record).put("label", label).put("note", note)));
            if (r.statusCode() != 201) {
                return;
            }
            ledger.add(new AckLedger.Ack(AckLedger.Kind.LABEL, cycle, record, person, note, label));
            if (rng.nextDouble() < UNDO_SHARE && send(token, "POST", pool + "labels/undo",
                    Json.write(Json.object().put("record", record))).statusCode() == 200) {
                ledger.add(new AckLedger.Ack(AckLedger.Kind.WITHDRAWAL, cycle, record, person, note, label));
            }
        }, 0);
    }

    /** Overrides labels acknowledged earlier, each with a reason of its own. */
    private void reviewer(SplittableRandom rng) {
        AtomicInteger n = new AtomicInteger();
        turns(() -> {
            List<AckLedger.Ack> labels = ledger.labels();
            if (labels.isEmpty()) {
                return;
            }
            AckLedger.Ack target = labels.get(rng.nextInt(labels.size()));
            String label = CLASSES.get(rng.nextInt(CLASSES.size()));
            String reason = "c" + cycle + "-review-" + n.getAndIncrement();
            HttpResponse<String> r = send(tokens.reviewer(), "POST", "pools/" + POOL + "/reviews",
                    Json.write(Json.object().put("record", target.record()).put("verdict", "override")
                            .put("label", label).put("reason", reason)));
            if (r.statusCode() == 201) {
                ledger.add(new AckLedger.Ack(AckLedger.Kind.REVIEW, cycle, target.record(), "reviewer",
                        reason, label));
            }
        }, REVIEW_PAUSE_MILLIS);
    }

    /** Changes the lease length (each change to a value never used before) and adds and changes accounts. */
    private void admin() {
        AtomicInteger n = new AtomicInteger();
        turns(() -> {
            int minutes = settingsCounter.getAndIncrement();
            if (send(tokens.admin(), "PUT", "pools/" + POOL + "/settings",
                    "{\"lease_minutes\":" + minutes + "}").statusCode() == 200) {
                ledger.add(new AckLedger.Ack(AckLedger.Kind.SETTINGS, cycle, null, "lead",
                        Integer.toString(minutes), null));
            }
            String member = n.getAndIncrement() % 2 == 0 ? members.poll() : null;
            if (member != null && send(tokens.admin(), "PUT", "users/" + member,
                    "{\"role\":\"reviewer\"}").statusCode() == 200) {
                ledger.add(new AckLedger.Ack(AckLedger.Kind.ACCOUNT, cycle, null, "lead", member,
                        "reviewer"));
            }
        }, ADMIN_PAUSE_MILLIS);
    }

    /**
     * Adds one account: the server hashes its password with the full PBKDF2 work, which takes a
     * while on a busy machine, so the kill may well come first.
     */
    private void addAccount() {
        String name = "added-in-life-" + cycle;
        try {
            if (send(tokens.admin(), "POST", "users", Json.write(Json.object().put("name", name)
                    .put("role", "labeller").put("password", "campaign-" + name))).statusCode() == 201) {
                ledger.add(new AckLedger.Ack(AckLedger.Kind.ACCOUNT, cycle, null, "lead", name, null));
            }
        } catch (HttpTimeoutException slow) {
            timedOut();
        } catch (IOException | InterruptedException e) {
            stopped(e);
        }
    }

    /**
     * Sends a request. Until the campaign kills the server, a request that fails to reach it (a
     * kept-alive connection the server closed just as it was reused, a connection not accepted in
     * time on a starved machine) is counted as dropped and sent again a moment later; once the
     * server has been killed, the failure ends this client's life.
     */
    private HttpResponse<String> send(String token, String method, String path, String body)
            throws IOException, InterruptedException {
        HttpRequest request = HttpRequest.newBuilder(URI.create(base + path))
                .timeout(Duration.ofSeconds(30)).header("Authorization", "Bearer " + token)
                .header("Content-Type", "application/json")
                .method(method, HttpRequest.BodyPublishers.ofString(body)).build();
        HttpResponse<String> r = null;
        while (r == null) {
            try {
                r = http.send(request, HttpResponse.BodyHandlers.ofString());
            } catch (HttpTimeoutException e) {
                throw e;
            } catch (IOException e) {
                if (killed.get()) {
                    throw e;
                }
                desk.dropped.incrementAndGet();
                Thread.sleep(RESEND_PAUSE_MILLIS);
            }
        }
        if (r.statusCode() == BUSY) {
            busy.incrementAndGet();
        } else if (r.statusCode() >= 500) {
            serverErrors.incrementAndGet();
        }
        return r;
    }
}
