package dev.dowser.team;

/**
 * Who is making a request, once signed in. {@code csrfToken} and {@code sessionHash} are set for a
 * browser session and null for an API token (a token is never sent by a browser on its own, so
 * it needs no forgery check).
 */
public record Caller(String name, Role role, String csrfToken, String sessionHash) {

    public boolean viaSession() {
        return sessionHash != null;
    }
}
