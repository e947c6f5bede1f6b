package dev.dowser.web;

import dev.dowser.team.Role;
import io.undertow.server.HttpHandler;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * One API call or page: its method, its path ({@code {x}} matches one path segment, bound as the
 * parameter {@code x}), the roles allowed (none: anyone, signed in or not), the body it takes, and
 * the handler. The template is split once, here, not on every request.
 */
record Route(String method, String template, Set<Role> roles, Body body, HttpHandler handler,
             List<String> segments) {

    /**
     * What a call reads from its request. The gate reads bounded bodies before the handler runs,
     * without holding a thread while they arrive, and refuses any body over its limit unread.
     */
    enum Body {
        /** Nothing: a body sent anyway is refused past {@link Requests#MAX_JSON_BODY_BYTES}, never read. */
        NONE,
        /** A JSON document of at most {@link Requests#MAX_JSON_BODY_BYTES}, read in full first. */
        JSON,
        /** The head of a file, at most {@link ImportsApi#MAX_PREVIEW_BYTES}, read in full first. */
        FILE_HEAD,
        /** A whole file, streamed by the handler up to the server's upload limit. */
        UPLOAD
    }

    Route(String method, String template, Set<Role> roles, Body body, HttpHandler handler) {
        this(method, template, Set.copyOf(roles), body, handler, List.of(template.split("/", -1)));
    }

    Route(String method, String template, Set<Role> roles, HttpHandler handler) {
        this(method, template, roles, Body.NONE, handler);
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
