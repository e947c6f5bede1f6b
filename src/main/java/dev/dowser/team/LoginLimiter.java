package dev.dowser.team;

import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.HashMap;
import java.util.HashSet;
import java.util.Map;
import java.util.Set;

/**
 * Holds back password guessing. Lock-out by account and address together, with delays that grow
 * (OWASP's Authentication Cheat Sheet advises both; the numbers are our own):
 * <ul>
 *   <li>A pair of account and address has {@code freeFailures} failed attempts within the window;
 *       after the k-th failure past them it waits 2^k seconds (1 s, 2 s, 4 s, ... at most
 *       {@code maxHoldMinutes}). So a guesser at one address is slowed to a crawl on that account,
 *       while its owner, at another address, signs in as ever, and so does everyone else behind the
 *       guesser's address on their own accounts.</li>
 *   <li>Guessing spread out (an account failing from more than {@code spreadLimit} addresses, or one
 *       address failing on more than {@code spreadLimit} accounts) slows every attempt on that
 *       account, or from that address, by the same doubling, but only up to
 *       {@value #SPREAD_HOLD_SECONDS} s: a slowdown that nobody can turn into a lock-out.</li>
 *   <li>Each attempt is checked and reserved in one step, and counts as a failure until its
 *       password check ends: parallel guesses cannot slip past the limit together.</li>
 * </ul>
 * In memory: a restart forgets, which costs a guesser one window at most. Entries leave with their
 * window; the door in front of sign-in bounds how fast they can be made.
 */
final class LoginLimiter {

    /** The most a spread-out guessing campaign can make an attempt wait. */
    static final long SPREAD_HOLD_SECONDS = 60;

    private final Clock clock;
    private final Duration window;
    private final int freeFailures;
    private final int spreadLimit;
    private final long maxHoldSeconds;
    private final Map<String, Pair> pairs = new HashMap<>();
    private final Map<String, Deque<Failure>> byAccount = new HashMap<>();
    private final Map<String, Deque<Failure>> byAddress = new HashMap<>();

    /** One failure: when, and the other half of its pair (the address for an account, and so on). */
    private record Failure(Instant at, String other) {
    }

    private static final class Pair {
        final Deque<Instant> failures = new ArrayDeque<>();
        int inFlight;
    }

    LoginLimiter(Clock clock, TeamConfig config) {
        this.clock = clock;
        this.window = Duration.ofMinutes(config.failureWindowMinutes());
        this.freeFailures = config.freeFailures();
        this.spreadLimit = config.spreadLimit();
        this.maxHoldSeconds = config.maxHoldMinutes() * 60L;
    }

    /** A password check in progress; end it once with its outcome. */
    final class Attempt {
        private final String account;
        private final String address;
        private boolean ended;

        private Attempt(String account, String address) {
            this.account = account;
            this.address = address;
        }

        void end(boolean succeeded) {
            synchronized (LoginLimiter.this) {
                if (ended) {
                    return;
                }
                ended = true;
                Pair p = pairs.get(key(account, address));
                if (p != null) {
                    p.inFlight--;
                }
                if (succeeded) {
                    pairs.remove(key(account, address));
                    return;
                }
                Instant now = clock.instant();
                pairs.computeIfAbsent(key(account, address), k -> new Pair()).failures.addLast(now);
                byAccount.computeIfAbsent(account, k -> new ArrayDeque<>()).addLast(new Failure(now, address));
                byAddress.computeIfAbsent(address, k -> new ArrayDeque<>()).addLast(new Failure(now, account));
            }
        }
    }

    /** Lets an attempt be checked, or refuses it (HELD_BACK, with the seconds to wait) while its pair or spread is held. */
    synchronized Attempt begin(String account, String address) {
        Instant now = clock.instant();
        prune(now);
        Pair p = pairs.computeIfAbsent(key(account, address), k -> new Pair());
        if (p.inFlight > 0 && p.failures.size() + p.inFlight >= freeFailures) {
            throw held(1, "another sign-in to this account from your address is being checked");
        }
        if (p.failures.size() >= freeFailures) {
            long hold = Math.min(maxHoldSeconds, 1L << Math.min(40, p.failures.size() - freeFailures));
            refuseUntil(p.failures.peekLast().plusSeconds(hold), now, "too many failed sign-ins to this account"
                    + " from your address");
        }
        spread(byAccount.get(account), now, "too many failed sign-ins to this account from many addresses");
        spread(byAddress.get(address), now, "too many failed sign-ins from your address to many accounts");
        p.inFlight++;
        return new Attempt(account, address);
    }

    private void spread(Deque<Failure> failures, Instant now, String why) {
        if (failures == null) {
            return;
        }
        Set<String> others = new HashSet<>();
        for (Failure f : failures) {
            others.add(f.other());
        }
        if (others.size() > spreadLimit) {
            long hold = Math.min(SPREAD_HOLD_SECONDS, 1L << Math.min(40, others.size() - spreadLimit - 1));
            refuseUntil(failures.peekLast().at().plusSeconds(hold), now, why);
        }
    }

    private static void refuseUntil(Instant free, Instant now, String why) {
        if (now.isBefore(free)) {
            long seconds = Math.max(1, Duration.between(now, free).toMillis() / 1000 + 1);
            throw held(seconds, why);
        }
    }

    private static AuthException held(long seconds, String why) {
        return new AuthException(AuthException.Kind.HELD_BACK, why + "; try again in " + seconds + " s", seconds);
    }

    /** Drops failures older than the window, and entries left empty, so memory follows the window. */
    private void prune(Instant now) {
        Instant cutoff = now.minus(window);
        pairs.values().removeIf(p -> {
            while (!p.failures.isEmpty() && !p.failures.peekFirst().isAfter(cutoff)) {
                p.failures.removeFirst();
            }
            return p.failures.isEmpty() && p.inFlight == 0;
        });
        for (Map<String, Deque<Failure>> m : java.util.List.of(byAccount, byAddress)) {
            m.values().removeIf(d -> {
                while (!d.isEmpty() && !d.peekFirst().at().isAfter(cutoff)) {
                    d.removeFirst();
                }
                return d.isEmpty();
            });
        }
    }

    private static String key(String account, String address) {
        return account + '\u0000' + address;
    }
}
