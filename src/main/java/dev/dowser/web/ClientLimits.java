package dev.dowser.web;

/**
 * How long the server waits for slow clients and how many people who are not signed in it serves
 * at once; validated here. Every wait is bounded, so no client can hold a connection or a thread
 * without end, and requests from people not signed in run in their own small lane, so a crowd of
 * them never slows down the people at work.
 *
 * @param headerTimeoutMillis   a request's headers must arrive within this, from their first byte
 * @param idleTimeoutMillis     a connection with no request in flight is closed after this
 * @param bodyTimeoutMillis     a JSON body (or the head of a file for a preview) must arrive within this
 * @param uploadStallMillis     an upload that sends nothing for this long is ended
 * @param writeTimeoutMillis    a response the client stops reading is ended after this
 * @param maxAnonymousRequests  requests from people not signed in served at once; more get 503
 * @param anonymousThreads      threads that serve them (signing in hashes a password: CPU-bound)
 */
public record ClientLimits(int headerTimeoutMillis, int idleTimeoutMillis, int bodyTimeoutMillis,
                           int uploadStallMillis, int writeTimeoutMillis, int maxAnonymousRequests,
                           int anonymousThreads) {

    public static final int DEFAULT_HEADER_TIMEOUT_MILLIS = 10_000;
    public static final int DEFAULT_IDLE_TIMEOUT_MILLIS = 60_000;
    public static final int DEFAULT_BODY_TIMEOUT_MILLIS = 10_000;
    public static final int DEFAULT_UPLOAD_STALL_MILLIS = 30_000;
    public static final int DEFAULT_WRITE_TIMEOUT_MILLIS = 60_000;
    public static final int DEFAULT_MAX_ANONYMOUS_REQUESTS = 64;

    public ClientLimits {
        positive("headerTimeoutMillis", headerTimeoutMillis);
        positive("idleTimeoutMillis", idleTimeoutMillis);
        positive("bodyTimeoutMillis", bodyTimeoutMillis);
        positive("uploadStallMillis", uploadStallMillis);
        positive("writeTimeoutMillis", writeTimeoutMillis);
        positive("maxAnonymousRequests", maxAnonymousRequests);
        positive("anonymousThreads", anonymousThreads);
        if (anonymousThreads > maxAnonymousRequests) {
            throw new IllegalArgumentException("anonymousThreads (" + anonymousThreads + ") cannot exceed"
                    + " maxAnonymousRequests (" + maxAnonymousRequests + ")");
        }
    }

    /** The defaults: one thread per core (at least two) for people not signed in. */
    public static ClientLimits defaults() {
        return new ClientLimits(DEFAULT_HEADER_TIMEOUT_MILLIS, DEFAULT_IDLE_TIMEOUT_MILLIS,
                DEFAULT_BODY_TIMEOUT_MILLIS, DEFAULT_UPLOAD_STALL_MILLIS, DEFAULT_WRITE_TIMEOUT_MILLIS,
                DEFAULT_MAX_ANONYMOUS_REQUESTS, Math.max(2, Runtime.getRuntime().availableProcessors()));
    }

    /** The same with other body and upload waits (tests use short ones). */
    public ClientLimits withBodyTimeouts(int bodyMillis, int uploadStall) {
        return new ClientLimits(headerTimeoutMillis, idleTimeoutMillis, bodyMillis, uploadStall, writeTimeoutMillis,
                maxAnonymousRequests, anonymousThreads);
    }

    /** The same serving at most {@code n} requests from people not signed in at once. */
    public ClientLimits withMaxAnonymousRequests(int n) {
        return new ClientLimits(headerTimeoutMillis, idleTimeoutMillis, bodyTimeoutMillis, uploadStallMillis,
                writeTimeoutMillis, n, Math.min(anonymousThreads, n));
    }

    private static void positive(String name, int value) {
        if (value < 1) {
            throw new IllegalArgumentException(name + " must be at least 1, got " + value);
        }
    }
}
