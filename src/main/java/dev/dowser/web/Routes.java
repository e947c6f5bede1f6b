package dev.dowser.web;

import dev.dowser.team.Role;
import io.undertow.server.HttpHandler;
import io.undertow.server.handlers.BlockingHandler;
import java.util.EnumSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;

/**
 * The route table: every API call and every page, with the roles allowed and the handler. It is
 * the only place access is decided ({@link Gate} applies it to every request) and the only place a
 * handler is mounted, so a call cannot exist without its rule: a path missing from the table is
 * answered 404, whatever code exists for it.
 */
final class Routes {

    static final String API_PREFIX = "/api/v1";
    /** Anyone, signed in or not. */
    static final Set<Role> PUBLIC = EnumSet.noneOf(Role.class);
    static final Set<Role> ANYONE_SIGNED_IN = EnumSet.allOf(Role.class);
    static final Set<Role> REVIEWERS = EnumSet.of(Role.REVIEWER, Role.ADMIN);
    static final Set<Role> ADMINS = EnumSet.of(Role.ADMIN);

    /** A route that fits a request, with the path's parameters. */
    record Match(Route route, Map<String, String> params) {
    }

    private final List<Route> api;
    private final List<Route> pages;

    Routes(TeamApi team, PoolsApi pools, ImportsApi imports, DeskApi desk, RoundsApi rounds, AdviceApi advice,
           ReviewApi review, HttpHandler events, HttpHandler files) {
        // Paths relative to API_PREFIX.
        this.api = List.of(
                call("POST", "/session", PUBLIC, team::login),
                call("GET", "/session", ANYONE_SIGNED_IN, team::session),
                call("DELETE", "/session", ANYONE_SIGNED_IN, team::logout),
                call("PUT", "/session/password", ANYONE_SIGNED_IN, team::changeOwnPassword),
                call("GET", "/tokens", ANYONE_SIGNED_IN, team::tokens),
                call("POST", "/tokens", ANYONE_SIGNED_IN, team::newToken),
                call("DELETE", "/tokens/{id}", ANYONE_SIGNED_IN, team::revokeToken),
                call("GET", "/users", ADMINS, team::users),
                call("POST", "/users", ADMINS, team::addUser),
                call("PUT", "/users/{name}", ADMINS, team::changeUser),
                call("GET", "/users/{name}/tokens", ADMINS, team::tokensOf),
                call("DELETE", "/users/{name}/tokens/{id}", ADMINS, team::revokeTokenOf),
                call("GET", "/pools", ANYONE_SIGNED_IN, pools::listPools),
                call("GET", "/pools/{pool}", ANYONE_SIGNED_IN, pools::pool),
                call("GET", "/pools/{pool}/records", REVIEWERS, pools::records),
                call("GET", "/pools/{pool}/export", ADMINS, pools::export),
                call("GET", "/pools/{pool}/export/metadata", ADMINS, pools::exportMetadata),
                call("POST", "/imports", ADMINS, Route.Body.UPLOAD, imports::startImport),
                call("GET", "/imports/{id}", ADMINS, imports::importStatus),
                call("POST", "/previews", ADMINS, Route.Body.FILE_HEAD, imports::preview),
                call("POST", "/pools/{pool}/queue/next", ANYONE_SIGNED_IN, desk::next),
                call("POST", "/pools/{pool}/queue/skip", ANYONE_SIGNED_IN, desk::skip),
                call("POST", "/pools/{pool}/queue/release", ANYONE_SIGNED_IN, desk::release),
                call("POST", "/pools/{pool}/labels", ANYONE_SIGNED_IN, desk::label),
                call("POST", "/pools/{pool}/labels/undo", ANYONE_SIGNED_IN, desk::undo),
                call("GET", "/pools/{pool}/labels/mine", ANYONE_SIGNED_IN, desk::mine),
                call("GET", "/pools/{pool}/rounds", ANYONE_SIGNED_IN, rounds::list),
                call("POST", "/pools/{pool}/rounds", REVIEWERS, rounds::request),
                call("GET", "/pools/{pool}/queue", ANYONE_SIGNED_IN, rounds::queue),
                call("GET", "/pools/{pool}/accuracy", ANYONE_SIGNED_IN, advice::accuracy),
                call("GET", "/pools/{pool}/advice", ANYONE_SIGNED_IN, advice::advice),
                call("GET", "/pools/{pool}/settings", ANYONE_SIGNED_IN, rounds::settings),
                call("PUT", "/pools/{pool}/settings", ADMINS, rounds::changeSettings),
                call("GET", "/pools/{pool}/settings/history", REVIEWERS, rounds::settingsHistory),
                call("GET", "/pools/{pool}/review", REVIEWERS, review::list),
                call("POST", "/pools/{pool}/reviews", REVIEWERS, review::decide),
                call("GET", "/pools/{pool}/records/{record}/history", REVIEWERS, review::history),
                call("GET", "/pools/{pool}/agreement", ANYONE_SIGNED_IN, review::agreement),
                // An event stream stays open: it must not be read in blocking mode.
                new Route("GET", "/events", ANYONE_SIGNED_IN, events));
        this.pages = List.of(
                new Route("GET", "/login.html", PUBLIC, files),
                new Route("GET", "/", ANYONE_SIGNED_IN, files),
                new Route("GET", "/index.html", ANYONE_SIGNED_IN, files),
                new Route("GET", "/desk.html", ANYONE_SIGNED_IN, files),
                new Route("GET", "/overview.html", ANYONE_SIGNED_IN, files),
                new Route("GET", "/account.html", ANYONE_SIGNED_IN, files),
                new Route("GET", "/review.html", REVIEWERS, files),
                new Route("GET", "/users.html", ADMINS, files));
    }

    /** A JSON call: a JSON body unless it only reads; its handler reads and writes in blocking mode. */
    private static Route call(String method, String template, Set<Role> roles, HttpHandler handler) {
        return call(method, template, roles, method.equals("GET") || method.equals("DELETE") ? Route.Body.NONE
                : Route.Body.JSON, handler);
    }

    private static Route call(String method, String template, Set<Role> roles, Route.Body body,
                              HttpHandler handler) {
        return new Route(method, template, roles, body, new BlockingHandler(handler));
    }

    List<Route> api() {
        return api;
    }

    List<Route> pages() {
        return pages;
    }

    /** The API route for a method and a path relative to {@link #API_PREFIX}, if there is one. */
    Optional<Match> api(String method, String path) {
        return find(api, method, path);
    }

    /** True when some API route has this path under another method: the answer is then 405, not 404. */
    boolean apiPathExists(String path) {
        String[] split = path.split("/", -1);
        return api.stream().anyMatch(r -> r.match(split) != null);
    }

    Optional<Match> page(String method, String path) {
        return find(pages, method.equals("HEAD") ? "GET" : method, path);
    }

    /** Scripts and styles: public, served as they are. */
    static boolean isAsset(String path) {
        return (path.startsWith("/js/") || path.startsWith("/css/")) && !path.contains("..");
    }

    private static Optional<Match> find(List<Route> routes, String method, String path) {
        String[] split = path.split("/", -1);
        for (Route r : routes) {
            if (r.method().equals(method)) {
                Map<String, String> params = r.match(split);
                if (params != null) {
                    return Optional.of(new Match(r, params));
                }
            }
        }
        return Optional.empty();
    }
}
