package dev.dowser.team;

/**
 * How long sessions live and how failed sign-ins are held back ({@link LoginLimiter}); validated here.
 *
 * @param idleMinutes          a session unused this long ends
 * @param absoluteHours        a session ends this long after login, used or not
 * @param freeFailures         failed sign-ins of one account from one address within the window before
 *                             each further attempt waits (1 s, 2 s, 4 s, ...)
 * @param spreadLimit          addresses failing on one account, or accounts failing from one address,
 *                             within the window before every attempt on it is slowed (at most a minute)
 * @param failureWindowMinutes the window the failures are counted in
 * @param maxHoldMinutes       the longest one account and address are made to wait
 * @param iterations           PBKDF2 iterations for new password hashes
 */
public record TeamConfig(int idleMinutes, int absoluteHours, int freeFailures, int spreadLimit,
                         int failureWindowMinutes, int maxHoldMinutes, int iterations) {

    public static final int DEFAULT_IDLE_MINUTES = 120;
    public static final int DEFAULT_ABSOLUTE_HOURS = 12;
    public static final int DEFAULT_FREE_FAILURES = 5;
    public static final int DEFAULT_SPREAD_LIMIT = 10;
    public static final int DEFAULT_FAILURE_WINDOW_MINUTES = 15;
    public static final int DEFAULT_MAX_HOLD_MINUTES = 15;

    public TeamConfig {
        if (idleMinutes < 1) {
            throw new IllegalArgumentException("idleMinutes must be at least 1, got " + idleMinutes);
        }
        if (absoluteHours < 1 || absoluteHours * 60L < idleMinutes) {
            throw new IllegalArgumentException("absoluteHours must be at least 1 and cover idleMinutes ("
                    + idleMinutes + "), got " + absoluteHours);
        }
        if (freeFailures < 1 || spreadLimit < 1) {
            throw new IllegalArgumentException("freeFailures and spreadLimit must be at least 1, got " + freeFailures
                    + " and " + spreadLimit);
        }
        if (failureWindowMinutes < 1 || maxHoldMinutes < 1 || maxHoldMinutes > failureWindowMinutes) {
            throw new IllegalArgumentException("failureWindowMinutes and maxHoldMinutes must be at least 1, the hold"
                    + " no longer than the window; got " + failureWindowMinutes + " and " + maxHoldMinutes);
        }
        if (iterations < 1) {
            throw new IllegalArgumentException("iterations must be at least 1, got " + iterations);
        }
    }

    public static TeamConfig defaults() {
        return new TeamConfig(DEFAULT_IDLE_MINUTES, DEFAULT_ABSOLUTE_HOURS, DEFAULT_FREE_FAILURES,
                DEFAULT_SPREAD_LIMIT, DEFAULT_FAILURE_WINDOW_MINUTES, DEFAULT_MAX_HOLD_MINUTES, Passwords.ITERATIONS);
    }

    /** The same with {@code n} PBKDF2 iterations: tests use few, to stay fast. */
    public TeamConfig withIterations(int n) {
        return new TeamConfig(idleMinutes, absoluteHours, freeFailures, spreadLimit, failureWindowMinutes,
                maxHoldMinutes, n);
    }
}
