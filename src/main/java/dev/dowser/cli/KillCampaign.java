package dev.dowser.cli;

import dev.dowser.data.FileFormat;
import dev.dowser.data.ImportProgress;
import dev.dowser.data.ImportSpec;
import dev.dowser.data.Importer;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Strategy;
import dev.dowser.store.Database;
import dev.dowser.team.Accounts;
import dev.dowser.team.Caller;
import dev.dowser.team.Role;
import dev.dowser.team.TeamConfig;
import java.io.IOException;
import java.io.InputStream;
import java.io.PrintWriter;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.SecureRandom;
import java.time.Clock;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicLong;

/**
 * Acknowledged means durable, tried the hard way: the real server runs as its own process while
 * labellers label and take labels back, a reviewer overrides, and an admin changes settings and
 * accounts, all as fast as they can; at a random moment the server gets SIGKILL, and is started
 * again on the same folder. After the last kill every write that was answered with success must
 * be in the database. Nobody asks for the first round, as nobody would in a new team's first hour:
 * the server serves the new pool's first batch by itself.
 *
 * <p>A kill comes once the server's life has acknowledged a number of writes drawn between
 * {@code minWrites} and {@code maxWrites}, and then up to {@link #JITTER_MILLIS} later: the moment is
 * random with respect to the writes in flight, and the count of writes tried does not depend on how
 * busy the machine is.
 *
 * @param kills     how many times the server is killed
 * @param labellers labelling clients at once (besides one reviewer and one admin)
 * @param minWrites fewest writes acknowledged in one life of the server before its kill
 * @param maxWrites most
 * @param seed      the kill moments and the clients' choices
 */
record KillCampaign(int kills, int labellers, int minWrites, int maxWrites, long seed) {

    static final String POOL = "kills";
    /** Records in the pool, at least; a longer campaign gets more (see {@link #records()}). */
    static final int MIN_RECORDS = 3_000;
    static final int FEATURES = 8;
    static final List<String> CLASSES = List.of("north", "south", "east", "west");
    /** A large batch keeps the desk full between rounds, so the clients spend their time writing. */
    static final int BATCH = 200;
    /** A tenth of the labels are taken back at once, so withdrawals are tried as often as labels. */
    static final double UNDO_SHARE = 0.1;
    /** Pauses of the reviewer and the admin between writes: most writes are labels, as at a real desk. */
    static final int REVIEW_PAUSE_MILLIS = 100;
    static final int ADMIN_PAUSE_MILLIS = 200;
    /** The kill lands up to this long after the life's quota of writes, at a uniformly random moment. */
    static final int JITTER_MILLIS = 300;
    /** A life that cannot reach its quota in this long is killed anyway, and the campaign fails. */
    static final Duration LIFE_DEADLINE = Duration.ofMinutes(3);

    KillCampaign {
        if (kills < 1 || labellers < 1 || minWrites < 0 || maxWrites < minWrites) {
            throw new IllegalArgumentException("a campaign needs at least one kill and one labeller, and"
                    + " 0 <= minWrites <= maxWrites; got " + kills + ", " + labellers + ", " + minWrites + ", "
                    + maxWrites);
        }
    }

    /**
     * Records in the pool: more than the campaign can write, so that labellers never run out of
     * unlabelled records and every answer without one is an empty desk.
     */
    int records() {
        return Math.max(MIN_RECORDS, kills * maxWrites + BATCH);
    }

    /**
     * What a campaign did: the check of its acknowledged writes, the server's failures (5xx other than
     * busy), its "busy, try again" answers, requests with no answer in time, restart times, and the
     * desk's answers: those with a record, and those without one once the first batch was served
     * (with the first such answer's message), and requests that did not reach the live server and were
     * sent again.
     */
    record Report(AckLedger.Check check, long serverErrors, long busy, long timeouts, List<Double> startSeconds,
                  long offered, long empty, String firstEmpty, long dropped) {
    }

    /**
     * Runs the campaign in {@code dir} (a new folder), starting the server with {@code launcher} (the
     * java command up to and excluding {@code serve}). Progress goes to {@code log}.
     */
    Report run(Path dir, List<String> launcher, PrintWriter log) throws IOException, InterruptedException {
        Path data = dir.resolve("data");
        Tokens tokens = prepare(dir, data);
        AckLedger ledger = new AckLedger();
        AtomicLong serverErrors = new AtomicLong();
        AtomicLong busy = new AtomicLong();
        AtomicLong timeouts = new AtomicLong();
        CampaignClients.Desk desk = new CampaignClients.Desk();
        AtomicInteger settingsCounter = new AtomicInteger(100);
        java.util.Queue<String> members = new java.util.concurrent.ConcurrentLinkedQueue<>(tokens.members());
        SplittableRandom rng = new SplittableRandom(seed);
        List<Double> starts = new ArrayList<>();
        Path serverLog = dir.resolve("server.log");
        for (int cycle = 0; cycle < kills; cycle++) {
            long t0 = System.nanoTime();
            try (ServerProcess server = ServerProcess.start(launcher, data, serverLog)) {
                starts.add((System.nanoTime() - t0) / 1e9);
                CampaignClients clients = new CampaignClients(server.port(), tokens, members, ledger, serverErrors,
                        busy, timeouts, desk, settingsCounter, cycle, rng.split());
                long before = ledger.size();
                long quota = minWrites + rng.nextInt(maxWrites - minWrites + 1);
                clients.start(labellers);
                long began = System.nanoTime();
                long deadline = began + LIFE_DEADLINE.toNanos();
                while (ledger.size() - before < quota && System.nanoTime() < deadline && clients.working()) {
                    Thread.sleep(5);
                }
                Thread.sleep(rng.nextInt(JITTER_MILLIS + 1));
                clients.killing();
                server.kill();
                clients.join();
                if (ledger.size() - before < quota) {
                    throw new IllegalStateException("life " + (cycle + 1) + " acknowledged only "
                            + (ledger.size() - before) + " of " + quota + " writes in " + LIFE_DEADLINE.toSeconds()
                            + " s" + (clients.firstStop() == null ? "" : " (a client stopped first: "
                            + clients.firstStop() + ")") + "; see " + serverLog);
                }
                log.printf("durability: kill %d of %d after %d ms and %d writes; %d acknowledged so far%n", cycle + 1,
                        kills, (System.nanoTime() - began) / 1_000_000, ledger.size() - before, ledger.size());
                log.flush();
            }
        }
        try (Database db = Database.open(data, Clock.systemUTC())) {
            return new Report(ledger.check(db, POOL), serverErrors.get(), busy.get(), timeouts.get(), starts,
                    desk.offered.get(), desk.empty.get(), desk.firstEmpty.get(), desk.dropped.get());
        }
    }

    /**
     * API tokens of the people the clients act as, and the names of accounts the admin may change
     * (each once, from labeller to reviewer, so the role an account has shows whether its change was kept).
     */
    record Tokens(String admin, String reviewer, List<String> labellers, List<String> labellerNames,
                  List<String> members) {
    }

    /** Accounts made for the admin to change, per life of the server: more than it gets through. */
    static final int MEMBERS_PER_LIFE = 100;

    /** A new data folder holding the pool (no labels) and the accounts; the server is not running yet. */
    private Tokens prepare(Path dir, Path data) throws IOException {
        Path csv = dir.resolve("kills.csv");
        SplittableRandom rng = new SplittableRandom(seed);
        try (Writer w = Files.newBufferedWriter(csv, StandardCharsets.UTF_8)) {
            StringBuilder line = new StringBuilder("id");
            for (int f = 0; f < FEATURES; f++) {
                line.append(",f").append(f);
            }
            w.write(line.append('\n').toString());
            for (int i = 0; i < records(); i++) {
                line.setLength(0);
                line.append("k").append(i);
                for (int f = 0; f < FEATURES; f++) {
                    line.append(',');
                    BenchCommand.appendFixed4(line, rng.nextGaussian());
                }
                w.write(line.append('\n').toString());
            }
        }
        try (Database db = Database.open(data, Clock.systemUTC()); InputStream in = Files.newInputStream(csv)) {
            new Importer(db).run(in, "kills.csv", ImportSpec.defaults(POOL, FileFormat.CSV).withId("id")
                    .withClasses(CLASSES), ImportProgress.NONE);
            db.pools().updateSettings(db.pools().require(POOL).id(), new PoolSettings(BATCH,
                    PoolSettings.DEFAULT_SPOT_CHECK_SHARE, PoolSettings.DEFAULT_LEASE_MINUTES, Strategy.BALD,
                    PoolSettings.DEFAULT_DOUBLE_LABEL_SHARE).toJson(), "campaign");
            // Only tokens are used, never these passwords, so they are hashed with few iterations.
            Accounts accounts = new Accounts(db, new SecureRandom(), TeamConfig.defaults().withIterations(1_000));
            List<String> labellerTokens = new ArrayList<>();
            List<String> names = new ArrayList<>();
            for (int i = 0; i < labellers; i++) {
                names.add("labeller-" + i);
                labellerTokens.add(token(accounts, names.get(i), Role.LABELLER));
            }
            List<String> members = new ArrayList<>();
            for (int i = 0; i < MEMBERS_PER_LIFE * kills; i++) {
                members.add("member-" + i);
                accounts.add(members.get(i), Role.LABELLER, UsersCommand.generatePassword(new SecureRandom()),
                        "campaign");
            }
            return new Tokens(token(accounts, "lead", Role.ADMIN), token(accounts, "reviewer", Role.REVIEWER),
                    labellerTokens, names, members);
        }
    }

    private static String token(Accounts accounts, String name, Role role) {
        accounts.add(name, role, UsersCommand.generatePassword(new SecureRandom()), "campaign");
        return accounts.newToken(new Caller(name, role, null, null), "campaign");
    }
}
