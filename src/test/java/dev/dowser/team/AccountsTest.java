package dev.dowser.team;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.store.Database;
import dev.dowser.store.HistoryStore;
import java.nio.file.Path;
import java.security.SecureRandom;
import java.time.Duration;
import java.util.List;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class AccountsTest {

    @TempDir
    Path dir;
    final TestSupport.MutableClock clock = new TestSupport.MutableClock();
    Database db;
    Accounts accounts;

    @BeforeEach
    void open() {
        db = Database.open(dir.resolve("db"), clock);
        accounts = new Accounts(db, new SecureRandom(), TestSupport.FAST_TEAM);
    }

    @AfterEach
    void close() {
        db.close();
    }

    @Test
    void aServerHasAnAdminOnlyWhileOneIsEnabled() {
        assertFalse(accounts.hasAdmin(), "a new database has no account");
        accounts.add("ben", Role.REVIEWER, "long enough pw", "test");
        assertFalse(accounts.hasAdmin(), "a reviewer is not an admin");
        accounts.add("ada", Role.ADMIN, "long enough pw", "test");
        assertTrue(accounts.hasAdmin());
        accounts.setDisabled("ada", true, "test");
        assertFalse(accounts.hasAdmin(), "a disabled admin manages nothing");
    }

    @Test
    void anAdminChangesOthersButNeverTheirOwnRoleOrAccess() {
        accounts.add("ada", Role.ADMIN, "long enough pw", "test");
        accounts.add("ben", Role.LABELLER, "long enough pw", "test");
        assertEquals("reviewer", accounts.change("ben", Role.REVIEWER, null, null, "ada").role());
        assertTrue(accounts.change("ben", null, true, null, "ada").disabled());
        var own = assertThrows(dev.dowser.store.ConflictException.class,
                () -> accounts.change("ada", Role.LABELLER, null, null, "ada"));
        assertEquals("you cannot change your own role or disable yourself; ask another admin", own.getMessage());
        assertThrows(dev.dowser.store.ConflictException.class, () -> accounts.change("ada", null, true, null, "ada"));
        assertEquals("admin", db.users().require("ada").role(), "a refused change leaves the account as it was");
        IllegalArgumentException shortPassword = assertThrows(IllegalArgumentException.class,
                () -> accounts.change("ben", Role.ADMIN, null, "short", "ada"));
        assertTrue(shortPassword.getMessage().contains("password"), shortPassword.getMessage());
        assertEquals("reviewer", db.users().require("ben").role(), "nothing of a refused change is kept");
        accounts.change("ada", null, false, "a new long password", "ada");
        assertTrue(accounts.login("ada", "a new long password", "10.0.0.9").token().length() > 0);
    }

    @Test
    void sessionsEndWhenIdleWhenTooOldAndOnSignOut() {
        accounts.add("ana", Role.LABELLER, "long enough pw", "test");
        String idle = accounts.login("ana", "long enough pw", "10.0.0.1").token();
        clock.advance(Duration.ofMinutes(TeamConfig.DEFAULT_IDLE_MINUTES - 1));
        assertTrue(accounts.session(idle).isPresent(), "used within the idle time");
        clock.advance(Duration.ofMinutes(TeamConfig.DEFAULT_IDLE_MINUTES - 1));
        assertTrue(accounts.session(idle).isPresent(), "each use renews the idle time");
        clock.advance(Duration.ofMinutes(TeamConfig.DEFAULT_IDLE_MINUTES + 1));
        assertTrue(accounts.session(idle).isEmpty(), "idle too long");

        String busy = accounts.login("ana", "long enough pw", "10.0.0.1").token();
        for (int i = 0; i < TeamConfig.DEFAULT_ABSOLUTE_HOURS * 2; i++) {
            assertTrue(accounts.session(busy).isPresent(), "half-hour " + i);
            clock.advance(Duration.ofMinutes(30));
        }
        clock.advance(Duration.ofMinutes(1));
        assertTrue(accounts.session(busy).isEmpty(), "ended by the absolute limit, however busy");

        Accounts.SignIn in = accounts.login("ana", "long enough pw", "10.0.0.1");
        accounts.logout(in.caller());
        assertTrue(accounts.session(in.token()).isEmpty(), "the old cookie is dead on the server");
    }

    @Test
    void disablingStopsSessionsAndTokensAtOnce() {
        accounts.add("ben", Role.REVIEWER, "long enough pw", "test");
        Accounts.SignIn in = accounts.login("ben", "long enough pw", "10.0.0.2");
        String token = accounts.newToken(in.caller(), "script");
        assertTrue(Accounts.wellFormedToken(token), token);
        assertEquals("ben", accounts.token(token).orElseThrow().name());
        accounts.setDisabled("ben", true, "ada");
        assertTrue(accounts.session(in.token()).isEmpty());
        assertTrue(accounts.token(token).isEmpty());
        assertThrows(AuthException.class, () -> accounts.login("ben", "long enough pw", "10.0.0.2"));
        accounts.setDisabled("ben", false, "ada");
        assertTrue(accounts.token(token).isEmpty(), "enabling again brings no old token back");
        assertEquals(List.of(), accounts.tokens(in.caller()), "the list holds live tokens only");

        Accounts.SignIn again = accounts.login("ben", "long enough pw", "10.0.0.2");
        String second = accounts.newToken(again.caller(), "second script");
        long id = accounts.tokens(again.caller()).get(0).id();
        assertTrue(accounts.revokeToken(again.caller(), id));
        assertTrue(accounts.token(second).isEmpty(), "revoked");
        assertFalse(accounts.revokeToken(again.caller(), id), "already revoked");

        List<HistoryStore.Change> history = db.history().of(null, "account:ben");
        assertEquals(List.of("account-added", "account-disabled", "tokens-revoked", "account-enabled"),
                history.stream().map(HistoryStore.Change::kind).toList());
        assertEquals("ada", history.get(1).actor());
        assertEquals("1 live", history.get(2).before());
    }

    /** Issue 11: tokens kept working after an admin reset the password, and no admin could revoke them. */
    @Test
    void aResetRevokesEveryTokenAndAdminsRevokeAnyone() {
        accounts.add("ada", Role.ADMIN, "long enough pw", "test");
        accounts.add("cy", Role.LABELLER, "long enough pw", "test");
        Caller cy = accounts.login("cy", "long enough pw", "10.0.0.7").caller();
        String one = accounts.newToken(cy, "one");
        String two = accounts.newToken(cy, "two");
        String three = accounts.newToken(cy, "three");
        assertEquals(3L, accounts.liveTokenCounts().get("cy"));
        assertEquals(List.of("one", "two", "three"), accounts.tokensOf("cy").stream().map(t -> t.name()).toList());

        long twoId = accounts.tokensOf("cy").get(1).id();
        assertTrue(accounts.revokeTokenOf("cy", twoId, "ada"));
        assertTrue(accounts.token(two).isEmpty());
        assertTrue(accounts.token(one).isPresent(), "the others stay");
        assertFalse(accounts.revokeTokenOf("ada", accounts.tokensOf("cy").get(0).id(), "ada"),
                "a token is revoked under its own account only");

        accounts.resetPassword("cy", "an admin's new one", "ada");
        assertTrue(accounts.token(one).isEmpty() && accounts.token(three).isEmpty(), "a reset revokes them all");
        assertEquals(List.of(), accounts.tokensOf("cy"));
        assertEquals(null, accounts.liveTokenCounts().get("cy"));
        assertEquals(List.of("account-added", "token-revoked", "password-reset", "tokens-revoked"),
                db.history().of(null, "account:cy").stream().map(HistoryStore.Change::kind).toList());
    }

    /**
     * Issue 11: the lock-out held the owner and everyone behind the guesser's address. Now a pair of
     * account and address is held, with waits that double; the owner elsewhere, and the guesser's
     * neighbours on their own accounts, sign in as ever.
     */
    @Test
    void failedSignInsHoldTheAccountAndAddressTogetherWithGrowingWaits() {
        accounts.add("cy", Role.LABELLER, "long enough pw", "test");
        accounts.add("dee", Role.LABELLER, "long enough pw", "test");
        String guesser = "10.0.0.3";
        for (int i = 0; i < TeamConfig.DEFAULT_FREE_FAILURES; i++) {
            AuthException e = assertThrows(AuthException.class, () -> accounts.login("cy", "wrong guess!", guesser));
            assertEquals(AuthException.Kind.NOT_SIGNED_IN, e.kind());
        }
        AuthException held = assertThrows(AuthException.class, () -> accounts.login("cy", "long enough pw", guesser));
        assertEquals(AuthException.Kind.HELD_BACK, held.kind(), "even the right password waits there");
        assertEquals("too many failed sign-ins to this account from your address; try again in 2 s", held.getMessage());
        assertEquals("cy", accounts.login("cy", "long enough pw", "10.0.0.9").caller().name(), "the owner elsewhere");
        assertEquals("dee", accounts.login("dee", "long enough pw", guesser).caller().name(), "a neighbour");

        // Each further failure doubles the wait: 1, 2, 4, 8 ... seconds (reported rounded up, plus one).
        assertEquals(List.of(2L, 3L, 5L, 9L, 17L, 33L, 65L, 129L), waits(accounts, "cy", guesser, 8));

        // Up to the longest hold: here 5 minutes, in a window of an hour so that no failure leaves it.
        Accounts capped = new Accounts(db, new SecureRandom(), new TeamConfig(120, 12, 5, 10, 60, 5, 1_000));
        for (int i = 0; i < 5; i++) {
            assertThrows(AuthException.class, () -> capped.login("dee", "wrong guess!", guesser));
        }
        assertEquals(List.of(2L, 3L, 5L, 9L, 17L, 33L, 65L, 129L, 257L, 301L, 301L), waits(capped, "dee", guesser, 11));
    }

    /** How long each of {@code n} held attempts is told to wait, failing once after each wait. */
    private List<Long> waits(Accounts a, String name, String address, int n) {
        List<Long> waits = new java.util.ArrayList<>();
        for (int i = 0; i < n; i++) {
            AuthException wait = assertThrows(AuthException.class, () -> a.login(name, "wrong guess!", address));
            assertEquals(AuthException.Kind.HELD_BACK, wait.kind());
            waits.add(wait.retryAfterSeconds());
            clock.advance(Duration.ofSeconds(wait.retryAfterSeconds()));
            assertEquals(AuthException.Kind.NOT_SIGNED_IN,
                    assertThrows(AuthException.class, () -> a.login(name, "wrong guess!", address)).kind());
        }
        return waits;
    }

    /** Issue 11: 18 of 30 parallel guesses were checked against a limit of 5. Now exactly 5 are. */
    @Test
    void parallelGuessesAreCheckedAgainstTheLimitAtOnce() throws Exception {
        accounts.add("eve", Role.LABELLER, "long enough pw", "test");
        int guesses = 30;
        java.util.concurrent.CountDownLatch go = new java.util.concurrent.CountDownLatch(1);
        java.util.concurrent.ExecutorService pool = java.util.concurrent.Executors.newFixedThreadPool(guesses);
        List<java.util.concurrent.Future<AuthException.Kind>> outcomes = new java.util.ArrayList<>();
        for (int i = 0; i < guesses; i++) {
            outcomes.add(pool.submit(() -> {
                go.await();
                return assertThrows(AuthException.class, () -> accounts.login("eve", "wrong guess!", "10.0.0.8")).kind();
            }));
        }
        go.countDown();
        java.util.Map<AuthException.Kind, Integer> count = new java.util.EnumMap<>(AuthException.Kind.class);
        for (var f : outcomes) {
            count.merge(f.get(), 1, Integer::sum);
        }
        pool.shutdown();
        assertEquals(TeamConfig.DEFAULT_FREE_FAILURES, count.get(AuthException.Kind.NOT_SIGNED_IN),
                "checked against the password: " + count);
        assertEquals(guesses - TeamConfig.DEFAULT_FREE_FAILURES, count.get(AuthException.Kind.HELD_BACK), count.toString());
    }

    /** Guessing spread over many addresses, or one address over many accounts, is slowed, never locked out. */
    @Test
    void spreadGuessingIsSlowedByAtMostAMinute() {
        accounts.add("fay", Role.LABELLER, "long enough pw", "test");
        for (int a = 0; a <= TeamConfig.DEFAULT_SPREAD_LIMIT; a++) {
            String address = "10.1.0." + a;
            assertThrows(AuthException.class, () -> accounts.login("fay", "wrong guess!", address));
        }
        AuthException slowed = assertThrows(AuthException.class, () -> accounts.login("fay", "long enough pw", "10.9.9.9"));
        assertEquals("too many failed sign-ins to this account from many addresses; try again in 2 s", slowed.getMessage());
        clock.advance(Duration.ofSeconds(2));
        assertEquals("fay", accounts.login("fay", "long enough pw", "10.9.9.9").caller().name());

        // One address trying a name after another: past 10 names each attempt from it waits, at most a minute.
        List<Long> waits = new java.util.ArrayList<>();
        for (int n = 0; n < 20; n++) {
            String name = "guess-" + n;
            AuthException e = assertThrows(AuthException.class, () -> accounts.login(name, "wrong guess!", "10.0.0.66"));
            if (e.kind() == AuthException.Kind.HELD_BACK) {
                waits.add(e.retryAfterSeconds());
                clock.advance(Duration.ofSeconds(e.retryAfterSeconds()));
                assertEquals(AuthException.Kind.NOT_SIGNED_IN, assertThrows(AuthException.class,
                        () -> accounts.login(name, "wrong guess!", "10.0.0.66")).kind());
            }
        }
        assertEquals(List.of(2L, 3L, 5L, 9L, 17L, 33L, 61L, 61L, 61L), waits);
        AuthException sprayer = assertThrows(AuthException.class, () -> accounts.login("fay", "long enough pw", "10.0.0.66"));
        assertEquals(AuthException.Kind.HELD_BACK, sprayer.kind());
        assertEquals(LoginLimiter.SPREAD_HOLD_SECONDS + 1, sprayer.retryAfterSeconds(), "at most a minute");
    }

    @Test
    void namesAndRolesAreCheckedWithTheRule() {
        assertEquals("an account name has 1 to 100 letters, digits, spaces or . _ @ -, and starts with no space",
                assertThrows(IllegalArgumentException.class, () -> accounts.add(" x", Role.ADMIN, "long enough pw", "t"))
                        .getMessage());
        assertThrows(IllegalArgumentException.class, () -> accounts.add("<b>", Role.ADMIN, "long enough pw", "t"));
        assertEquals("unknown role 'boss': use labeller, reviewer or admin",
                assertThrows(IllegalArgumentException.class, () -> Role.parse("boss")).getMessage());
        accounts.add("Zoë Ng", Role.ADMIN, "long enough pw", "t");
        assertEquals("there is already an account named 'Zoë Ng'", assertThrows(RuntimeException.class,
                () -> accounts.add("Zoë Ng", Role.LABELLER, "long enough pw", "t")).getMessage());
    }

    @Test
    void changingOnesOwnPasswordNeedsTheCurrentOneAndEndsOtherSessions() {
        accounts.add("dee", Role.LABELLER, "long enough pw", "test");
        Accounts.SignIn here = accounts.login("dee", "long enough pw", "10.0.0.4");
        Accounts.SignIn elsewhere = accounts.login("dee", "long enough pw", "10.0.0.5");
        AuthException wrong = assertThrows(AuthException.class,
                () -> accounts.changeOwnPassword(here.caller(), "not my password", "a newer password", "10.0.0.4"));
        assertEquals("the current password is wrong", wrong.getMessage());
        assertTrue(accounts.session(elsewhere.token()).isPresent(), "a refused change ends nothing");
        accounts.changeOwnPassword(here.caller(), "long enough pw", "a newer password", "10.0.0.4");
        assertTrue(accounts.session(here.token()).isPresent(), "the session that changed it stays");
        assertTrue(accounts.session(elsewhere.token()).isEmpty(), "other sessions end");
        assertThrows(AuthException.class, () -> accounts.login("dee", "long enough pw", "10.0.0.4"));
        assertEquals("dee", accounts.login("dee", "a newer password", "10.0.0.4").caller().name());
        assertEquals("password-changed", db.history().of(null, "account:dee").get(1).kind());
        accounts.resetPassword("dee", "an admin's new one", "ada");
        assertTrue(accounts.session(here.token()).isEmpty(), "an admin's reset ends every session");
    }
}
