package dev.dowser.team;

/**
 * How long sessions live and how many failed logins are let through; validated here.
 *
 * @param idleMinutes          a session unused this long ends
 * @param absoluteHours        a session ends this long after login, used or not
 * @param failuresPerAccount   failed logins for one account within {@code failureWindowMinutes} before it is held
 * @param failuresPerAddress   failed logins from one address within the window before it is held
 * @param failureWindowMinutes the window the failures are counted in
 * @param iterations           PBKDF2 iterations for new password hashes
 */
public record TeamConfig(int idleMinutes, int absoluteHours, int failuresPerAccount, int failuresPerAddress,
                         int failureWindowMinutes, int iterations) {

    public static final int DEFAULT_IDLE_MINUTES = 120;
    public static final int DEFAULT_ABSOLUTE_HOURS = 12;
    public static final int DEFAULT_FAILURES_PER_ACCOUNT = 5;
    public static final int DEFAULT_FAILURES_PER_ADDRESS = 20;
    public static final int DEFAULT_FAILURE_WINDOW_MINUTES = 15;

    public TeamConfig {
        if (idleMinutes < 1) {
            throw new IllegalArgumentException("idleMinutes must be at least 1, got " + idleMinutes);
        }
        if (absoluteHours < 1 || absoluteHours * 60L < idleMinutes) {
            throw new IllegalArgumentException("absoluteHours must be at least 1 and cover idleMinutes ("
                    + idleMinutes + "), got " + absoluteHours);
        }
        if (failuresPerAccount < 1 || failuresPerAddress < 1) {
            throw new IllegalArgumentException("failuresPerAccount and failuresPerAddress must be at least 1");
        }
        if (failureWindowMinutes < 1) {
            throw new IllegalArgumentException("failureWindowMinutes must be at least 1, got " + failureWindowMinutes);
        }
        if (iterations < 1) {
            throw new IllegalArgumentException("iterations must be at least 1, got " + iterations);
        }
    }

    public static TeamConfig defaults() {
        return new TeamConfig(DEFAULT_IDLE_MINUTES, DEFAULT_ABSOLUTE_HOURS, DEFAULT_FAILURES_PER_ACCOUNT,
                DEFAULT_FAILURES_PER_ADDRESS, DEFAULT_FAILURE_WINDOW_MINUTES, Passwords.ITERATIONS);
    }

    /** The same with {@code n} PBKDF2 iterations: tests use few, to stay fast. */
    public TeamConfig withIterations(int n) {
        return new TeamConfig(idleMinutes, absoluteHours, failuresPerAccount, failuresPerAddress,
                failureWindowMinutes, n);
    }
}
