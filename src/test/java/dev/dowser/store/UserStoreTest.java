package dev.dowser.store;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * An account change and its history entries are one transaction (issue 11: a kill between the two
 * statements left a change without its history). Made to fail halfway on the real H2 database, by
 * an actor's name longer than the history's column holds, nothing of the change may remain.
 */
class UserStoreTest {

    @TempDir
    Path dir;
    Database db;

    @BeforeEach
    void open() {
        db = database(new TestSupport.MutableClock());
    }

    @AfterEach
    void close() {
        db.close();
    }

    /** The database the tests run on: an H2 file here, a PostgreSQL server in {@code UserStoreOnPostgresqlTest}. */
    Database database(java.time.Clock clock) {
        return Database.open(dir, clock);
    }

    private List<String> kinds(String name) {
        return db.history().of(null, "account:" + name).stream().map(HistoryStore.Change::kind).toList();
    }

    @Test
    void aChangeIsWrittenWithItsHistoryOrNotAtAll() {
        UserRow ben = db.users().add("ben", "labeller", "hash-1", "ada");
        db.users().addToken("token-hash", ben.id(), "script");
        db.users().addSession("session-hash", ben.id(), "csrf");
        String tooLong = "a".repeat(101);

        UserStore.AccountChange everything = new UserStore.AccountChange("reviewer", true, "hash-2", "password-reset",
                null, true);
        assertThrows(StoreException.class, () -> db.users().change("ben", everything, tooLong));
        UserRow after = db.users().require("ben");
        assertEquals(List.of("labeller", "hash-1", false), List.of(after.role(), after.passwordHash(), after.disabled()),
                "the account after a change that failed at its history");
        assertTrue(db.users().token("token-hash").orElseThrow().revokedAt() == null, "the token was revoked");
        assertTrue(db.users().session("session-hash").orElseThrow().endedAt() == null, "the session was ended");
        assertEquals(List.of("account-added"), kinds("ben"));

        UserRow changed = db.users().change("ben", everything, "ada");
        assertEquals(List.of("reviewer", "hash-2", true), List.of(changed.role(), changed.passwordHash(),
                changed.disabled()));
        assertFalse(db.users().token("token-hash").orElseThrow().revokedAt() == null);
        assertFalse(db.users().session("session-hash").orElseThrow().endedAt() == null);
        assertEquals(List.of("account-added", "role-changed", "account-disabled", "password-reset", "tokens-revoked"),
                kinds("ben"));
    }

    @Test
    void anAccountIsAddedWithItsHistoryOrNotAtAll() {
        assertThrows(StoreException.class, () -> db.users().add("cy", "labeller", "hash", "a".repeat(101)));
        assertTrue(db.users().find("cy").isEmpty(), "an account added without its history entry");
        db.users().add("cy", "labeller", "hash", "ada");
        ConflictException twice = assertThrows(ConflictException.class,
                () -> db.users().add("cy", "admin", "hash", "ada"));
        assertEquals("there is already an account named 'cy'", twice.getMessage());
        assertEquals(List.of("account-added"), kinds("cy"));
    }

    @Test
    void anAdminsRevocationIsWrittenWithItsHistory() {
        UserRow dee = db.users().add("dee", "labeller", "hash", "ada");
        db.users().addToken("t1", dee.id(), "one");
        long id = db.users().tokensOf("dee").get(0).id();
        assertThrows(StoreException.class, () -> db.users().revokeToken(id, "dee", "a".repeat(101)));
        assertEquals(1, db.users().tokensOf("dee").size(), "a token revoked without its history entry");
        assertTrue(db.users().revokeToken(id, "dee", "ada"));
        assertFalse(db.users().revokeToken(id, "dee", "ada"), "revoked twice");
        assertEquals(List.of("account-added", "token-revoked"), kinds("dee"));
    }
}
