package dev.dowser.web;

import dev.dowser.desk.Desk;
import dev.dowser.rounds.RoundWorkers;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.store.Database;
import dev.dowser.team.Accounts;
import dev.dowser.team.Reviews;
import dev.dowser.team.TeamConfig;
import io.undertow.Handlers;
import io.undertow.Undertow;
import io.undertow.server.HttpHandler;
import io.undertow.server.handlers.GracefulShutdownHandler;
import java.net.InetSocketAddress;
import java.security.SecureRandom;
import java.util.Optional;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The Undertow server: the JSON API under {@code /api/v1} and the pages from {@code web/}.
 * Closing it stops taking requests, ends the event streams, lets requests in flight finish, stops
 * a running round at a safe point (its chains saved), then stops.
 */
public final class WebServer implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(WebServer.class);
    static final long SHUTDOWN_WAIT_MILLIS = 20_000;
    /** Rounds are reproducible: every random number of a round comes from this seed's tree (the pool, the round, its consumer). */
    public static final long DEFAULT_SEED = 1;

    private final Undertow undertow;
    private final GracefulShutdownHandler graceful;
    private final ImportJobs imports;
    private final RoundWorkers rounds;
    private final Events events;
    private final Accounts accounts;
    private final Routes routes;
    private final boolean tls;

    private WebServer(Undertow undertow, GracefulShutdownHandler graceful, ImportJobs imports, RoundWorkers rounds,
                      Events events, Accounts accounts, Routes routes, boolean tls) {
        this.undertow = undertow;
        this.graceful = graceful;
        this.imports = imports;
        this.rounds = rounds;
        this.events = events;
        this.accounts = accounts;
        this.routes = routes;
        this.tls = tls;
    }

    public static WebServer start(Database db, WebConfig config) {
        return start(db, config, SamplerConfig.defaults(DEFAULT_SEED));
    }

    public static WebServer start(Database db, WebConfig config, SamplerConfig sampler) {
        return start(db, config, sampler, TeamConfig.defaults());
    }

    /** Starts the server; rounds sample with {@code sampler}, accounts and sessions follow {@code team}. */
    public static WebServer start(Database db, WebConfig config, SamplerConfig sampler, TeamConfig team) {
        ImportJobs imports = new ImportJobs(db, config.spoolDir(), config.maxUploadBytes());
        Events events = new Events();
        RoundWorkers rounds = new RoundWorkers(db, sampler, events);
        // Rounds a killed server left running are marked interrupted, short queues refilled, new pools served.
        rounds.watch();
        Accounts accounts = new Accounts(db, new SecureRandom(), team);
        Desk desk = new Desk(db, rounds, events);
        HttpHandler files = StaticFiles.handler();
        Routes routes = new Routes(new TeamApi(accounts), new PoolsApi(db), new ImportsApi(imports), new DeskApi(desk),
                new RoundsApi(db, rounds, desk), new ReviewApi(new Reviews(db)), events.handler(), files);
        HttpHandler gate = new Gate(accounts, routes, files);
        GracefulShutdownHandler graceful = Handlers.gracefulShutdown(config.trustProxy()
                ? Handlers.proxyPeerAddress(gate) : gate);
        Undertow.Builder builder = Undertow.builder().setHandler(graceful);
        if (config.tls() != null) {
            builder.addHttpsListener(config.port(), config.bind(), config.tls().context());
        } else {
            builder.addHttpListener(config.port(), config.bind());
        }
        Undertow undertow = builder.build();
        undertow.start();
        return new WebServer(undertow, graceful, imports, rounds, events, accounts, routes, config.tls() != null);
    }

    /** The route table the server was started with. */
    Routes routes() {
        return routes;
    }

    /** Asks for a round of the pool now, as {@code POST /api/v1/pools/{pool}/rounds} does. */
    public void requestRound(String pool) {
        rounds.worker(pool).request();
    }

    /** The one-time code that creates the first admin, while the server has no account. */
    public Optional<String> setupCode() {
        return accounts.setupCode();
    }

    public int port() {
        return ((InetSocketAddress) undertow.getListenerInfo().get(0).getAddress()).getPort();
    }

    public String address() {
        InetSocketAddress a = (InetSocketAddress) undertow.getListenerInfo().get(0).getAddress();
        String host = a.getAddress().isAnyLocalAddress() ? "localhost" : a.getHostString();
        return (tls ? "https://" : "http://") + host + ":" + a.getPort() + "/";
    }

    @Override
    public void close() {
        graceful.shutdown();
        // Event streams never end by themselves; end them so that only real requests are waited for.
        events.closeAll();
        try {
            if (!graceful.awaitShutdown(SHUTDOWN_WAIT_MILLIS)) {
                LOG.warn("requests still running after {} ms; stopping anyway", SHUTDOWN_WAIT_MILLIS);
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
        imports.close();
        // A running round stops at its chains' next safe point and saves them; no new one starts.
        rounds.close();
        undertow.stop();
    }
}
