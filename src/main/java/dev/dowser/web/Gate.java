package dev.dowser.web;

import dev.dowser.team.Accounts;
import dev.dowser.team.AuthException;
import dev.dowser.team.Caller;
import io.undertow.server.HttpHandler;
import io.undertow.server.HttpServerExchange;
import io.undertow.server.handlers.Cookie;
import io.undertow.util.AttachmentKey;
import io.undertow.util.HeaderMap;
import io.undertow.util.Headers;
import io.undertow.util.HttpString;
import java.net.URLEncoder;
import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.Executor;

/**
 * In front of every request: security headers, then who is asking (session cookie or bearer
 * token), then the forgery check for state-changing requests, then the role rule of
 * {@link Routes}, whose handler it then calls with the path's parameters bound. Handlers read the
 * signed-in {@link Caller} from the exchange and never decide access themselves; whatever they
 * throw becomes one error response in {@link Errors}.
 *
 * <p>Bodies: a declared body over the route's limit is refused with 413 before a byte is read;
 * bounded bodies (JSON, the head of a file) are read by {@link Bodies} before the handler runs,
 * without holding a thread while they arrive. Requests from people not signed in go through the
 * {@link Door}: a fixed number at once, served on their own threads.
 */
final class Gate implements HttpHandler {

    static final String SESSION_COOKIE = "dowser_session";
    static final String CSRF_HEADER = "X-Dowser-Csrf";
    static final AttachmentKey<Caller> CALLER = AttachmentKey.create(Caller.class);
    static final String CONTENT_SECURITY_POLICY = "default-src 'self'; script-src 'self'; style-src 'self';"
            + " img-src 'self' data:; connect-src 'self'; object-src 'none'; base-uri 'none'; form-action 'self';"
            + " frame-ancestors 'none'";
    private static final Set<String> SAFE_METHODS = Set.of("GET", "HEAD", "OPTIONS");

    private final Accounts accounts;
    private final Routes routes;
    private final HttpHandler assets;
    private final Door door;
    private final WebConfig config;

    Gate(Accounts accounts, Routes routes, HttpHandler assets, Door door, WebConfig config) {
        this.accounts = accounts;
        this.routes = routes;
        this.assets = assets;
        this.door = door;
        this.config = config;
    }

    @Override
    public void handleRequest(HttpServerExchange ex) throws Exception {
        if (ex.isInIoThread()) {
            // Reading a session touches the database: not on an I/O thread.
            ex.dispatch(this);
            return;
        }
        secureHeaders(ex.getResponseHeaders());
        if ("https".equals(ex.getRequestScheme())) {
            // Browsers that have seen the server over HTTPS keep to it for a year (common practice).
            ex.getResponseHeaders().put(new HttpString("Strict-Transport-Security"), "max-age=31536000");
        }
        String path = ex.getRelativePath();
        boolean api = path.equals(Routes.API_PREFIX) || path.startsWith(Routes.API_PREFIX + "/");
        try {
            if (api) {
                api(ex, path.substring(Routes.API_PREFIX.length()));
            } else {
                page(ex, path);
            }
        } catch (AuthException e) {
            if (api) {
                Errors.send(ex, e);
            } else if (e.kind() == AuthException.Kind.NOT_SIGNED_IN) {
                String back = path + (ex.getQueryString().isEmpty() ? "" : "?" + ex.getQueryString());
                ex.setStatusCode(303);
                ex.getResponseHeaders().put(Headers.LOCATION,
                        "/login.html?next=" + URLEncoder.encode(back, StandardCharsets.UTF_8));
                ex.endExchange();
            } else {
                Pages.send(ex, 403, "Not for your role", e.getMessage());
            }
        }
    }

    private void api(HttpServerExchange ex, String path) throws Exception {
        String method = ex.getRequestMethod().toString();
        Optional<Routes.Match> match = routes.api(method, path);
        if (match.isEmpty()) {
            Errors.send(ex, routes.apiPathExists(path)
                    ? new ApiException(405, method + " is not allowed on " + Routes.API_PREFIX + path)
                    : new ApiException(404, "no API call " + method + " " + Routes.API_PREFIX + path));
            return;
        }
        admit(ex, match.get().route(), method);
        proceed(ex, match.get());
    }

    /**
     * Refuses a body declared larger than the route takes, lets a request from someone not signed
     * in through the door (or answers 503), reads a bounded body, then calls the handler.
     */
    private void proceed(HttpServerExchange ex, Routes.Match match) throws Exception {
        Route.Body body = match.route().body();
        long limit = bodyLimit(body);
        // Undertow's own cut-off, past ours and what a refusal drops: the gate and the readers enforce the limit.
        ex.setMaxEntitySize(limit + LingeringClose.MAX_DROPPED_BYTES);
        long declared = ex.getRequestContentLength();
        if (declared > limit) {
            Errors.send(ex, body == Route.Body.UPLOAD ? ImportJobs.tooLarge(Bytes.text(declared), config)
                    : Bodies.tooLarge(ex, limit));
            return;
        }
        Executor executor = null;
        if (ex.getAttachment(CALLER) == null) {
            if (!door.enter(ex)) {
                return;
            }
            executor = door.lane();
        }
        HttpHandler handler = e -> call(e, match);
        // A body sent where none is taken is read the same way (and dropped), so that no thread waits for it.
        if (body != Route.Body.UPLOAD && !ex.isRequestComplete()) {
            Bodies.receive(ex, (int) limit, config.limits().bodyTimeoutMillis(), executor, handler);
        } else if (executor != null) {
            ex.dispatch(executor, handler);
        } else {
            handler.handleRequest(ex);
        }
    }

    private long bodyLimit(Route.Body body) {
        return switch (body) {
            case NONE, JSON -> Requests.MAX_JSON_BODY_BYTES;
            case FILE_HEAD -> ImportsApi.MAX_PREVIEW_BYTES;
            case UPLOAD -> config.maxUploadBytes();
        };
    }

    /** Calls the route's handler with the path's parameters bound; anything it throws becomes an error response. */
    private static void call(HttpServerExchange ex, Routes.Match match) {
        match.params().forEach(ex::addQueryParam);
        try {
            match.route().handler().handleRequest(ex);
        } catch (Exception e) {
            Errors.send(ex, e);
        }
    }

    private void page(HttpServerExchange ex, String path) throws Exception {
        if (Routes.isAsset(path)) {
            assets.handleRequest(ex);
            return;
        }
        String method = ex.getRequestMethod().toString();
        Optional<Routes.Match> match = routes.page(method, path);
        if (match.isEmpty()) {
            Pages.send(ex, 404, "No such page", "There is no page at " + path + ".");
            return;
        }
        admit(ex, match.get().route(), method);
        proceed(ex, match.get());
    }

    /** Signs the caller in, checks forgery for state changes and the route's roles; throws when refused. */
    private void admit(HttpServerExchange ex, Route route, String method) {
        Optional<Caller> caller = caller(ex);
        caller.ifPresent(c -> ex.putAttachment(CALLER, c));
        boolean unsafe = !SAFE_METHODS.contains(method);
        if (unsafe) {
            checkOrigin(ex);
        }
        if (route.isPublic()) {
            return;
        }
        Caller c = caller.orElseThrow(() -> new AuthException(AuthException.Kind.NOT_SIGNED_IN,
                "sign in first: this needs an account (a session cookie or an API token)"));
        if (unsafe && c.viaSession()) {
            String sent = ex.getRequestHeaders().getFirst(CSRF_HEADER);
            if (sent == null || !MessageDigest.isEqual(sent.getBytes(StandardCharsets.UTF_8),
                    c.csrfToken().getBytes(StandardCharsets.UTF_8))) {
                throw new AuthException(AuthException.Kind.FORBIDDEN, "request refused: the " + CSRF_HEADER
                        + " header is missing or wrong, so it may come from another site; reload the page");
            }
        }
        if (!route.roles().contains(c.role())) {
            throw new AuthException(AuthException.Kind.FORBIDDEN, "an account with the role " + c.role().word()
                    + " may not do this; ask an admin");
        }
    }

    private Optional<Caller> caller(HttpServerExchange ex) {
        String authorization = ex.getRequestHeaders().getFirst(Headers.AUTHORIZATION);
        if (authorization != null) {
            if (!authorization.regionMatches(true, 0, "Bearer ", 0, 7)) {
                throw new AuthException(AuthException.Kind.NOT_SIGNED_IN,
                        "the Authorization header must be 'Bearer' and an API token");
            }
            String token = authorization.substring(7).strip();
            if (!Accounts.wellFormedToken(token)) {
                throw new AuthException(AuthException.Kind.NOT_SIGNED_IN, "the Authorization header holds no whole"
                        + " Dowser API token (dowser., 52 letters and digits, a dot, 7 check characters); copy it again");
            }
            return Optional.of(accounts.token(token).orElseThrow(() ->
                    new AuthException(AuthException.Kind.NOT_SIGNED_IN,
                            "the API token is unknown, revoked, or its account is disabled")));
        }
        Cookie cookie = ex.getRequestCookie(SESSION_COOKIE);
        return cookie == null || cookie.getValue().isEmpty() ? Optional.empty() : accounts.session(cookie.getValue());
    }

    /** A browser names the page a request came from; one from another site is refused outright. */
    private static void checkOrigin(HttpServerExchange ex) {
        String origin = ex.getRequestHeaders().getFirst(Headers.ORIGIN);
        String site = ex.getRequestHeaders().getFirst(new HttpString("Sec-Fetch-Site"));
        boolean crossOrigin = origin != null && !origin.equals(ex.getRequestScheme() + "://" + ex.getHostAndPort());
        if (crossOrigin || "cross-site".equals(site)) {
            throw new AuthException(AuthException.Kind.FORBIDDEN,
                    "request refused: it comes from another site (Origin " + origin + ")");
        }
    }

    static void secureHeaders(HeaderMap h) {
        h.put(new HttpString("Content-Security-Policy"), CONTENT_SECURITY_POLICY);
        h.put(Headers.X_CONTENT_TYPE_OPTIONS, "nosniff");
        h.put(new HttpString("Referrer-Policy"), "same-origin");
        h.put(Headers.X_FRAME_OPTIONS, "DENY");
    }

    /** The signed-in caller; the gate has already refused requests that needed one and had none. */
    static Caller caller(HttpServerExchange ex, boolean required) {
        Caller c = ex.getAttachment(CALLER);
        if (c == null && required) {
            throw new AuthException(AuthException.Kind.NOT_SIGNED_IN, "sign in first");
        }
        return c;
    }
}
