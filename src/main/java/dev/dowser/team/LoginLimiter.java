package dev.dowser.team;

import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;

/**
 * Holds back password guessing: failed logins are counted per account and per address over a
 * sliding window; past the limit, further attempts are refused until the oldest failure leaves
 * the window. In memory: a restart forgets, which costs a guesser one window at most.
 */
final class LoginLimiter {

    private final Clock clock;
    private final Duration window;
    private final int perAccount;
    private final int perAddress;
    private final Map<String, Deque<Instant>> failures = new ConcurrentHashMap<>();

    LoginLimiter(Clock clock, TeamConfig config) {
        this.clock = clock;
        this.window = Duration.ofMinutes(config.failureWindowMinutes());
        this.perAccount = config.failuresPerAccount();
        this.perAddress = config.failuresPerAddress();
    }

    /** Seconds to wait before another attempt, or 0 when one may be made now. */
    long waitSeconds(String account, String address) {
        return Math.max(wait("account:" + account, perAccount), wait("address:" + address, perAddress));
    }

    void failed(String account, String address) {
        record("account:" + account);
        record("address:" + address);
    }

    void succeeded(String account) {
        failures.remove("account:" + account);
    }

    private long wait(String key, int limit) {
        Deque<Instant> times = failures.get(key);
        if (times == null) {
            return 0;
        }
        synchronized (times) {
            prune(times);
            if (times.size() < limit) {
                return 0;
            }
            Instant free = times.peekFirst().plus(window);
            return Math.max(1, Duration.between(clock.instant(), free).toSeconds());
        }
    }

    private void record(String key) {
        Deque<Instant> times = failures.computeIfAbsent(key, k -> new ArrayDeque<>());
        synchronized (times) {
            prune(times);
            times.addLast(clock.instant());
        }
    }

    private void prune(Deque<Instant> times) {
        Instant cutoff = clock.instant().minus(window);
        while (!times.isEmpty() && !times.peekFirst().isAfter(cutoff)) {
            times.removeFirst();
        }
    }
}
