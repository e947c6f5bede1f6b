package dev.dowser.store;

import dev.dowser.PostgresServer;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.Clock;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.extension.RegisterExtension;
import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * Acknowledged means durable on PostgreSQL too: Dowser's own sessions commit synchronously even where
 * the database's default was turned off (PostgreSQL documentation, "synchronous_commit": with off, a
 * crash of the server can lose the last transactions reported committed).
 */
class DurableCommitsOnPostgresqlTest {

    @RegisterExtension
    static final PostgresServer.ForClass PG = new PostgresServer.ForClass();

    private static String show(Connection c) throws SQLException {
        try (Statement s = c.createStatement(); ResultSet rs = s.executeQuery("SHOW synchronous_commit")) {
            rs.next();
            return rs.getString(1);
        }
    }

    @Test
    void commitsAreSynchronousWhateverTheDatabaseDefault() throws SQLException {
        String url = PG.server().create("lazy");
        try (Connection admin = DriverManager.getConnection(url, PostgresServer.USER, "");
             Statement s = admin.createStatement()) {
            s.execute("ALTER DATABASE d_lazy SET synchronous_commit = off");
        }
        try (Connection plain = DriverManager.getConnection(url, PostgresServer.USER, "")) {
            assertEquals("off", show(plain), "the database's default, as a careless set-up leaves it");
        }
        try (Database db = Database.connect(url, PostgresServer.USER, "", Clock.systemUTC());
             Connection c = db.dataSource().getConnection()) {
            assertEquals("on", show(c), "Dowser's commits would not wait for the log");
        }
    }
}
