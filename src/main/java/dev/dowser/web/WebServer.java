package dev.dowser.web;

import dev.dowser.desk.Desk;
import dev.dowser.desk.Overview;
import dev.dowser.rounds.AdviceService;
import dev.dowser.rounds.RoundWorkers;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.store.Database;
import dev.dowser.team.Accounts;
import dev.dowser.team.Reviews;
import dev.dowser.team.TeamConfig;
import io.undertow.Handlers;
import io.undertow.Undertow;
import io.undertow.UndertowOptions;
import io.undertow.server.HttpHandler;
import io.undertow.server.handlers.GracefulShutdownHandler;
import java.net.InetSocketAddress;
import java.nio.file.Path;
import java.security.SecureRandom;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import org.xnio.Options;

/**
 * The Undertow server: the JSON API under {@code /api/v1} and the pages from {@code web/}. It binds
 * its port first ({@link #listen}), answering 503 while the rest starts, so that a busy port is
 * found before anything is written; {@link #serve} then opens for business. Closing it stops
 * taking requests, ends the event streams, lets requests in flight finish, stops a running round
 * at a safe point (its chains saved), then stops.
 */
public final class WebServer implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(WebServer.class);
    static final long SHUTDOWN_WAIT_MILLIS = 20_000;

    /** What a served server runs, made by {@link #serve}. */
    private record Services(ImportJobs imports, RoundWorkers rounds, Events events, Accounts accounts, Routes routes,
                            Door door) {
    }

    private final Undertow undertow;
    private final GracefulShutdownHandler graceful;
    private final Starting front;
    private final WebConfig config;
    private volatile Services services;

    private WebServer(Undertow undertow, GracefulShutdownHandler graceful, Starting front, WebConfig config) {
        this.undertow = undertow;
        this.graceful = graceful;
        this.front = front;
        this.config = config;
    }

    public static WebServer start(Database db, WebConfig config) {
        return start(db, config, SamplerConfig.defaults());
    }

    public static WebServer start(Database db, WebConfig config, SamplerConfig sampler) {
        return start(db, config, sampler, TeamConfig.defaults());
    }

    /** Starts the server; rounds sample with {@code sampler}, accounts and sessions follow {@code team}. */
    public static WebServer start(Database db, WebConfig config, SamplerConfig sampler, TeamConfig team) {
        WebServer server = listen(config);
        try {
            return server.serve(db, sampler, team);
        } catch (RuntimeException e) {
            server.close();
            throw e;
        }
    }

    /**
     * Binds the port and answers every request with 503 (starting) until {@link #serve}.
     *
     * @throws PortBusyException when another program holds the port
     */
    public static WebServer listen(WebConfig config) {
        Starting front = new Starting();
        // A client that asks before sending its body (Expect: 100-continue) is told to go on only when
        // the body is read, so a refused one (413, 401) never sends it.
        HttpHandler continued = Handlers.httpContinueRead(front);
        GracefulShutdownHandler graceful = Handlers.gracefulShutdown(config.trustProxy()
                ? Handlers.proxyPeerAddress(continued) : continued);
        ClientLimits limits = config.limits();
        Undertow.Builder builder = Undertow.builder().setHandler(graceful)
                .setServerOption(UndertowOptions.REQUEST_PARSE_TIMEOUT, limits.headerTimeoutMillis())
                .setServerOption(UndertowOptions.NO_REQUEST_TIMEOUT, limits.idleTimeoutMillis())
                // The largest body any route takes; the gate sets each request's own limit below it.
                .setServerOption(UndertowOptions.MAX_ENTITY_SIZE, Math.max(config.maxUploadBytes(),
                        ImportsApi.MAX_PREVIEW_BYTES))
                // Not Options.READ_TIMEOUT: Undertow counts it from the last byte received whatever the
                // request is doing, so it would also end event streams and long imports; bodies have
                // their own deadlines (Bodies, UploadStream).
                .setSocketOption(Options.WRITE_TIMEOUT, limits.writeTimeoutMillis());
        if (config.tls() != null) {
            builder.addHttpsListener(config.port(), config.bind(), config.tls().context());
        } else {
            builder.addHttpListener(config.port(), config.bind());
        }
        Undertow undertow = builder.build();
        try {
            undertow.start();
        } catch (RuntimeException e) {
            throw PortBusyException.from(e, config.bind(), config.port());
        }
        return new WebServer(undertow, graceful, front, config);
    }

    /** Opens for business on {@code db}: rounds sample with {@code sampler}, accounts follow {@code team}. */
    public WebServer serve(Database db, SamplerConfig sampler, TeamConfig team) {
        return serve(db, config.spoolDir(), sampler, team);
    }

    /** The same, spooling uploads in {@code spoolDir} (made after the port was bound). */
    public synchronized WebServer serve(Database db, Path spoolDir, SamplerConfig sampler, TeamConfig team) {
        if (services != null) {
            throw new IllegalStateException("the server is serving already");
        }
        WebConfig config = this.config.withSpoolDir(spoolDir);
        ImportJobs imports = new ImportJobs(db, config);
        Events events = new Events();
        RoundWorkers rounds = new RoundWorkers(db, sampler, events);
        // Rounds a killed server left running are marked interrupted, short queues refilled, new pools served.
        rounds.watch();
        Accounts accounts = new Accounts(db, new SecureRandom(), team);
        Desk desk = new Desk(db, rounds, events);
        HttpHandler files = StaticFiles.handler();
        Overview overview = new Overview(db, rounds);
        Routes routes = new Routes(new TeamApi(accounts), new PoolsApi(db, overview), new ImportsApi(imports, config),
                new DeskApi(desk), new RoundsApi(overview, desk), new AdviceApi(new AdviceService(db)),
                new ReviewApi(new Reviews(db)), events.handler(), files);
        Door door = new Door(config.limits());
        services = new Services(imports, rounds, events, accounts, routes, door);
        front.open(new Gate(accounts, routes, files, door, config));
        return this;
    }

    /** The route table the server was started with. */
    Routes routes() {
        return served().routes();
    }

    private Services served() {
        Services s = services;
        if (s == null) {
            throw new IllegalStateException("the server listens but does not serve yet");
        }
        return s;
    }

    /** Asks for a round of the pool now, as {@code POST /api/v1/pools/{pool}/rounds} does. */
    public void requestRound(String pool) {
        served().rounds().worker(pool).request();
    }

    /** New pools get no first round by themselves from now on (for the fuzz campaign; see {@code RoundWorkers}). */
    void stopRoundWatch() {
        served().rounds().stopWatching();
    }

    /** Requests from people not signed in that are inside the door now (for tests of the door). */
    int strangersInside() {
        return served().door().inside();
    }

    public int port() {
        return ((InetSocketAddress) undertow.getListenerInfo().get(0).getAddress()).getPort();
    }

    public String address() {
        InetSocketAddress a = (InetSocketAddress) undertow.getListenerInfo().get(0).getAddress();
        String host = a.getAddress().isAnyLocalAddress() ? "localhost" : a.getHostString();
        return (config.tls() != null ? "https://" : "http://") + host + ":" + a.getPort() + "/";
    }

    @Override
    public void close() {
        graceful.shutdown();
        Services s = services;
        if (s != null) {
            // Event streams never end by themselves; end them so that only real requests are waited for.
            s.events().closeAll();
        }
        try {
            if (!graceful.awaitShutdown(SHUTDOWN_WAIT_MILLIS)) {
                LOG.warn("requests still running after {} ms; stopping anyway", SHUTDOWN_WAIT_MILLIS);
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
        if (s != null) {
            s.imports().close();
            s.door().close();
            // A running round stops at its chains' next safe point and saves them; no new one starts.
            s.rounds().close();
        }
        undertow.stop();
    }
}
