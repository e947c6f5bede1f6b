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
        assertTrue(token.startsWith(Accounts.TOKEN_PREFIX));
        assertEquals("ben", accounts.token(token).orElseThrow().name());
        accounts.setDisabled("ben", true, "ada");
        assertTrue(accounts.session(in.token()).isEmpty());
        assertTrue(accounts.token(token).isEmpty());
        assertThrows(AuthException.class, () -> accounts.login("ben", "long enough pw", "10.0.0.2"));
        accounts.setDisabled("ben", false, "ada");
        assertTrue(accounts.token(token).isPresent());
        long id = accounts.tokens(in.caller()).get(0).id();
        assertTrue(accounts.revokeToken(in.caller(), id));
        assertTrue(accounts.token(token).isEmpty(), "revoked");
        assertFalse(accounts.revokeToken(in.caller(), id), "already revoked");

        List<HistoryStore.Change> history = db.history().of(null, "account:ben");
        assertEquals(List.of("account-added", "account-disabled", "account-enabled"),
                history.stream().map(HistoryStore.Change::kind).toList());
        assertEquals("ada", history.get(1).actor());
    }

    @Test
    void failedSignInsAreHeldBackPerAccountAndPerAddress() {
        accounts.add("cy", Role.LABELLER, "long enough pw", "test");
        for (int i = 0; i < TeamConfig.DEFAULT_FAILURES_PER_ACCOUNT; i++) {
            AuthException e = assertThrows(AuthException.class, () -> accounts.login("cy", "wrong guess!", "10.0.0.3"));
            assertEquals(AuthException.Kind.NOT_SIGNED_IN, e.kind());
        }
        AuthException held = assertThrows(AuthException.class, () -> accounts.login("cy", "long enough pw", "10.0.0.9"));
        assertEquals(AuthException.Kind.HELD_BACK, held.kind(), "even the right password waits");
        assertEquals(TeamConfig.DEFAULT_FAILURE_WINDOW_MINUTES * 60L, held.retryAfterSeconds());
        clock.advance(Duration.ofMinutes(TeamConfig.DEFAULT_FAILURE_WINDOW_MINUTES).plusSeconds(1));
        assertEquals("cy", accounts.login("cy", "long enough pw", "10.0.0.9").caller().name());

        // One address trying many names is held back too, though no single name reached its limit.
        for (int i = 0; i < TeamConfig.DEFAULT_FAILURES_PER_ADDRESS; i++) {
            String name = "guess-" + i;
            assertThrows(AuthException.class, () -> accounts.login(name, "wrong guess!", "10.0.0.66"));
        }
        assertEquals(AuthException.Kind.HELD_BACK,
                assertThrows(AuthException.class, () -> accounts.login("cy", "long enough pw", "10.0.0.66")).kind());
    }

    @Test
    void namesAndRolesAreCheckedWithTheRule() {
        assertEquals("an account name has 1 to 100 letters, digits, spaces or . _ @ -, and starts with no space",
                assertThrows(IllegalArgumentException.class, () -> accounts.add(" x", Role.ADMIN, "long enough pw", "t"))
                        .getMessage());
        assertThrows(IllegalArgumentException.class, () -> accounts.add("<b>", Role.ADMIN, "long enough pw", "t"));
        assertEquals("unknown role 'boss': use admin, reviewer or labeller",
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
