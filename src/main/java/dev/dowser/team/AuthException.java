package dev.dowser.team;

/** A request refused for who is (or is not) making it; the message says what to do. */
public final class AuthException extends RuntimeException {

    /** Why: no valid sign-in, a role without the right, or too many failed logins. */
    public enum Kind { NOT_SIGNED_IN, FORBIDDEN, HELD_BACK }

    private final Kind kind;
    private final long retryAfterSeconds;

    public AuthException(Kind kind, String message) {
        this(kind, message, 0);
    }

    public AuthException(Kind kind, String message, long retryAfterSeconds) {
        super(message);
        this.kind = kind;
        this.retryAfterSeconds = retryAfterSeconds;
    }

    public Kind kind() {
        return kind;
    }

    public long retryAfterSeconds() {
        return retryAfterSeconds;
    }
}
