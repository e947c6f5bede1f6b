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

    /** Refuses an attempt while the account or the address has too many recent failures. */
    void check(String account, String address) {
        long wait = Math.max(wait("account:" + account, perAccount), wait("address:" + address, perAddress));
        if (wait > 0) {
            throw new AuthException(AuthException.Kind.HELD_BACK,
                    "too many failed sign-ins; try again in " + wait + " s", wait);
        }
    }

    void failed(String account, String address) {
        record("account:" + account);
        record("address:" + address);
    }

    void succeeded(String account) {
        failures.remove("account:" + account);
    }

    private long wait(String key, int limit) {
        long[] wait = {0};
        // Pruned under the map's lock for this key; a key left with no failure is dropped, so that
        // guesses from many addresses do not pile up in memory.
        failures.computeIfPresent(key, (k, times) -> {
            prune(times);
            if (times.size() >= limit) {
                Instant free = times.peekFirst().plus(window);
                wait[0] = Math.max(1, Duration.between(clock.instant(), free).toSeconds());
            }
            return times.isEmpty() ? null : times;
        });
        return wait[0];
    }

    private void record(String key) {
        failures.compute(key, (k, times) -> {
            Deque<Instant> t = times == null ? new ArrayDeque<>() : times;
            prune(t);
            t.addLast(clock.instant());
            return t;
        });
    }

    private void prune(Deque<Instant> times) {
        Instant cutoff = clock.instant().minus(window);
        while (!times.isEmpty() && !times.peekFirst().isAfter(cutoff)) {
            times.removeFirst();
        }
    }
}
