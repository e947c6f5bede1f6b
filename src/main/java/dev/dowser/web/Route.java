package dev.dowser.web;

import dev.dowser.team.Role;
import io.undertow.server.HttpHandler;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * One API call or page: its method, its path ({@code {x}} matches one path segment, bound as the
 * parameter {@code x}), the roles allowed (none: anyone, signed in or not), and the handler. The
 * template is split once, here, not on every request.
 */
record Route(String method, String template, Set<Role> roles, HttpHandler handler, List<String> segments) {

    Route(String method, String template, Set<Role> roles, HttpHandler handler) {
        this(method, template, Set.copyOf(roles), handler, List.of(template.split("/", -1)));
    }

    /** The path parameters when a path, split at its slashes, fits the template; null when it does not. */
    Map<String, String> match(String[] path) {
        if (segments.size() != path.length) {
            return null;
        }
        Map<String, String> params = null;
        for (int i = 0; i < path.length; i++) {
            String want = segments.get(i);
            if (want.startsWith("{") && want.endsWith("}")) {
                if (path[i].isEmpty()) {
                    return null;
                }
                if (params == null) {
                    params = new LinkedHashMap<>();
                }
                params.put(want.substring(1, want.length() - 1), path[i]);
            } else if (!want.equals(path[i])) {
                return null;
            }
        }
        return params == null ? Map.of() : params;
    }

    boolean isPublic() {
        return roles.isEmpty();
    }
}
