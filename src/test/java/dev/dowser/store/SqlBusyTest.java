package dev.dowser.store;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.SQLException;
import java.util.Optional;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A statement that waits too long for a lock another transaction holds is "busy, try again" (the
 * web layer answers 503 with Retry-After), not a failure of the server (500): the desk under a
 * burst of labels while a round publishes met exactly this. On the real H2 file database, with the
 * lock held by a second connection; the row is unchanged afterwards.
 */
class SqlBusyTest {

    @TempDir
    Path dir;
    Database db;
    Sql sql;

    @BeforeEach
    void open() {
        db = database(new TestSupport.MutableClock());
        sql = new Sql(db.dataSource());
        sql.update("make a table", "CREATE TABLE counters (id INT PRIMARY KEY, n INT NOT NULL)");
        sql.update("add a row", "INSERT INTO counters VALUES (1, 0)");
    }

    @AfterEach
    void close() {
        db.close();
    }

    /** The database the tests run on: an H2 file here, a PostgreSQL server in {@code SqlBusyOnPostgresqlTest}. */
    Database database(java.time.Clock clock) {
        return Database.open(dir, clock);
    }

    @Test
    void aLockNotGrantedInTimeIsBusyAndWritesNothing() throws SQLException {
        try (Connection holder = db.dataSource().getConnection()) {
            holder.setAutoCommit(false);
            Sql.update(holder, "UPDATE counters SET n = 1 WHERE id = 1");

            StoreException e = assertThrows(StoreException.class,
                    () -> sql.update("count", "UPDATE counters SET n = 2 WHERE id = 1"));
            assertInstanceOf(BusyException.class, e, "a lock timeout is busy, not a failure: " + e.getMessage());
            assertTrue(e.getMessage().contains("could not count in time"), e.getMessage());
            assertTrue(e.getMessage().contains("nothing was changed, try again"), e.getMessage());
            holder.rollback();
        }
        assertEquals(Optional.of(0), sql.first("read", "SELECT n FROM counters WHERE id = 1", rs -> rs.getInt(1)));
        sql.update("count", "UPDATE counters SET n = 2 WHERE id = 1");
        assertEquals(Optional.of(2), sql.first("read", "SELECT n FROM counters WHERE id = 1", rs -> rs.getInt(1)),
                "the same statement once the lock is free");
    }

    @Test
    void anyOtherFailureIsAStoreFailureNamingWhatFailed() {
        StoreException e = assertThrows(StoreException.class,
                () -> sql.update("add a second first row", "INSERT INTO counters VALUES (1, 5)"));
        assertFalse(e instanceof BusyException, "a key violation is not busy");
        assertTrue(e.getMessage().startsWith("cannot add a second first row: "), e.getMessage());
    }
}
