package dev.dowser.web;

import dev.dowser.team.Role;
import java.util.EnumSet;
import java.util.List;
import java.util.Optional;
import java.util.Set;

/**
 * Who may call what: every API route and every page, with the roles allowed. This table is the
 * only place access is decided ({@link Gate} applies it to every request); a route missing from
 * it is refused, so a new handler cannot be left open by accident.
 */
final class Access {

    /** Anyone, signed in or not. */
    static final Set<Role> PUBLIC = EnumSet.noneOf(Role.class);
    static final Set<Role> ANYONE_SIGNED_IN = EnumSet.allOf(Role.class);
    static final Set<Role> REVIEWERS = EnumSet.of(Role.REVIEWER, Role.ADMIN);
    static final Set<Role> ADMINS = EnumSet.of(Role.ADMIN);

    /**
     * One route (an API path relative to {@code /api/v1}, or a page's path); {@code {x}} matches one
     * path segment. The template is split once, here, not on every request.
     */
    record Route(String method, String template, Set<Role> roles, List<String> segments) {

        Route(String method, String template, Set<Role> roles) {
            this(method, template, roles, List.of(template.split("/", -1)));
        }

        /** Whether a path, split at its slashes, fits the template. */
        boolean matches(String[] path) {
            if (segments.size() != path.length) {
                return false;
            }
            for (int i = 0; i < path.length; i++) {
                String want = segments.get(i);
                boolean any = want.startsWith("{") && want.endsWith("}");
                if (any ? path[i].isEmpty() : !want.equals(path[i])) {
                    return false;
                }
            }
            return true;
        }

        boolean isPublic() {
            return roles.isEmpty();
        }
    }

    static final List<Route> API = List.of(
            new Route("GET", "/setup", PUBLIC),
            new Route("POST", "/setup", PUBLIC),
            new Route("POST", "/session", PUBLIC),
            new Route("GET", "/session", ANYONE_SIGNED_IN),
            new Route("DELETE", "/session", ANYONE_SIGNED_IN),
            new Route("PUT", "/session/password", ANYONE_SIGNED_IN),
            new Route("GET", "/tokens", ANYONE_SIGNED_IN),
            new Route("POST", "/tokens", ANYONE_SIGNED_IN),
            new Route("DELETE", "/tokens/{id}", ANYONE_SIGNED_IN),
            new Route("GET", "/users", ADMINS),
            new Route("POST", "/users", ADMINS),
            new Route("PUT", "/users/{name}", ADMINS),
            new Route("GET", "/pools", ANYONE_SIGNED_IN),
            new Route("GET", "/pools/{pool}", ANYONE_SIGNED_IN),
            new Route("GET", "/pools/{pool}/records", REVIEWERS),
            new Route("GET", "/pools/{pool}/export", ADMINS),
            new Route("POST", "/imports", ADMINS),
            new Route("GET", "/imports/{id}", ADMINS),
            new Route("POST", "/previews", ADMINS),
            new Route("POST", "/pools/{pool}/queue/next", ANYONE_SIGNED_IN),
            new Route("POST", "/pools/{pool}/queue/skip", ANYONE_SIGNED_IN),
            new Route("POST", "/pools/{pool}/labels", ANYONE_SIGNED_IN),
            new Route("POST", "/pools/{pool}/labels/undo", ANYONE_SIGNED_IN),
            new Route("GET", "/pools/{pool}/rounds", ANYONE_SIGNED_IN),
            new Route("POST", "/pools/{pool}/rounds", REVIEWERS),
            new Route("GET", "/pools/{pool}/queue", ANYONE_SIGNED_IN),
            new Route("GET", "/pools/{pool}/accuracy", ANYONE_SIGNED_IN),
            new Route("GET", "/pools/{pool}/settings", ANYONE_SIGNED_IN),
            new Route("PUT", "/pools/{pool}/settings", ADMINS),
            new Route("GET", "/pools/{pool}/settings/history", REVIEWERS),
            new Route("GET", "/pools/{pool}/review", REVIEWERS),
            new Route("POST", "/pools/{pool}/reviews", REVIEWERS),
            new Route("GET", "/pools/{pool}/records/{record}/history", REVIEWERS),
            new Route("GET", "/pools/{pool}/agreement", ANYONE_SIGNED_IN),
            new Route("GET", "/events", ANYONE_SIGNED_IN));

    /** Pages by path; their scripts and styles (under {@code /js/} and {@code /css/}) are public. */
    static final List<Route> PAGES = List.of(
            new Route("GET", "/login.html", PUBLIC),
            new Route("GET", "/", ANYONE_SIGNED_IN),
            new Route("GET", "/index.html", ANYONE_SIGNED_IN),
            new Route("GET", "/desk.html", ANYONE_SIGNED_IN),
            new Route("GET", "/overview.html", ANYONE_SIGNED_IN),
            new Route("GET", "/account.html", ANYONE_SIGNED_IN),
            new Route("GET", "/review.html", REVIEWERS),
            new Route("GET", "/users.html", ADMINS));

    private Access() {
    }

    /** The API route for a method and a path relative to {@code /api/v1}, if there is one. */
    static Optional<Route> api(String method, String path) {
        return find(API, method, path);
    }

    /** True when some route has this path under another method: the answer is then 405, not 404. */
    static boolean apiPathExists(String path) {
        String[] split = path.split("/", -1);
        return API.stream().anyMatch(r -> r.matches(split));
    }

    static Optional<Route> page(String method, String path) {
        String m = method.equals("HEAD") ? "GET" : method;
        return find(PAGES, m, path);
    }

    static boolean isAsset(String path) {
        return (path.startsWith("/js/") || path.startsWith("/css/")) && !path.contains("..");
    }

    private static Optional<Route> find(List<Route> routes, String method, String path) {
        String[] split = path.split("/", -1);
        return routes.stream().filter(r -> r.method().equals(method) && r.matches(split)).findFirst();
    }
}
