package dev.dowser.web;

import io.undertow.server.HttpServerExchange;
import io.undertow.util.Headers;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Semaphore;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.concurrent.atomic.AtomicInteger;

/**
 * Where requests from people not signed in wait: at most {@code maxAnonymousRequests} at once
 * (while their bodies arrive too), the rest answered 503 at once; they run on their own few
 * threads, so that signing in (a deliberately slow password hash) or a crowd of strangers never
 * takes the threads that serve the people at work.
 */
final class Door implements AutoCloseable {

    /** Seconds a refused client is asked to wait. */
    static final int RETRY_AFTER_SECONDS = 2;

    private final Semaphore permits;
    private final int capacity;
    private final ExecutorService lane;

    Door(ClientLimits limits) {
        this.capacity = limits.maxAnonymousRequests();
        this.permits = new Semaphore(capacity);
        AtomicInteger n = new AtomicInteger();
        this.lane = Executors.newFixedThreadPool(limits.anonymousThreads(), r -> {
            Thread t = new Thread(r, "dowser-door-" + n.incrementAndGet());
            t.setDaemon(true);
            return t;
        });
    }

    /** Lets the request in until it completes, or answers 503 and returns false when the door is full. */
    boolean enter(HttpServerExchange ex) {
        if (!permits.tryAcquire()) {
            ex.getResponseHeaders().put(Headers.RETRY_AFTER, RETRY_AFTER_SECONDS);
            Errors.send(ex, new ApiException(503, "the server is serving " + capacity + " requests from people"
                    + " not signed in and takes no more for now; try again in " + RETRY_AFTER_SECONDS + " s"));
            return false;
        }
        AtomicBoolean out = new AtomicBoolean();
        ex.addExchangeCompleteListener((done, next) -> {
            if (out.compareAndSet(false, true)) {
                permits.release();
            }
            next.proceed();
        });
        return true;
    }

    /** The threads that serve requests let in. */
    ExecutorService lane() {
        return lane;
    }

    /** Requests let in and not yet finished. */
    int inside() {
        return capacity - permits.availablePermits();
    }

    @Override
    public void close() {
        lane.shutdown();
        try {
            lane.awaitTermination(5, TimeUnit.SECONDS);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }
}
