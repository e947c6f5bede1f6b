package dev.dowser.store;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.PostgresServer;
import dev.dowser.TestSupport;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The PostgreSQL path itself, on a real server (Debian's postgresql package, see
 * {@link PostgresServer}): every migration script applies, the database really is PostgreSQL, a
 * second start applies nothing again, and the throw-away cluster is gone (stopped, folder removed)
 * once closed. The store's behaviour there is checked by the {@code *OnPostgresqlTest} classes,
 * which run the H2 tests of queues, leases, labels, reviews, accounts, rounds, chain states,
 * predictions, real rounds and export against it.
 */
class PostgresPathTest {

    @Test
    void everyMigrationAppliesOnPostgresqlAndTheClusterIsGoneAfterwards() throws Exception {
        Path folder;
        int port;
        try (PostgresServer server = PostgresServer.start()) {
            folder = server.folder();
            port = server.port();
            int scripts = Migrations.read().size();
            try (Database db = server.open("migrations", TestSupport.CLOCK)) {
                try (Connection c = db.dataSource().getConnection(); Statement s = c.createStatement()) {
                    assertEquals("PostgreSQL", c.getMetaData().getDatabaseProductName());
                    List<String> applied = new ArrayList<>();
                    try (ResultSet rs = s.executeQuery("SELECT script, success FROM flyway_schema_history"
                            + " WHERE version IS NOT NULL ORDER BY installed_rank")) {
                        while (rs.next()) {
                            assertTrue(rs.getBoolean(2), rs.getString(1) + " failed");
                            applied.add(rs.getString(1));
                        }
                    }
                    assertEquals(scripts, applied.size(), "applied " + applied);
                    try (ResultSet rs = s.executeQuery("SELECT data_type FROM information_schema.columns"
                            + " WHERE table_name = 'chain_states' AND column_name = 'kernel_state'")) {
                        assertTrue(rs.next());
                        assertEquals("bytea", rs.getString(1));
                    }
                }
            }
            // Opened again: Flyway finds every script applied, with the checksums it recorded.
            try (Database again = server.open("migrations", TestSupport.CLOCK)) {
                assertTrue(again.pools().list().isEmpty());
            }
            assertTrue(server.running());
        }
        assertFalse(Files.exists(folder), "the cluster's folder is removed");
        try (java.net.Socket s = new java.net.Socket(java.net.InetAddress.getLoopbackAddress(), port)) {
            throw new AssertionError("the server still answers on port " + port);
        } catch (java.io.IOException expected) {
            // stopped
        }
    }

    @Test
    void onlyPostgresqlAddressesAreTaken() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Database.connect("jdbc:mysql://127.0.0.1/x", "u", "", TestSupport.CLOCK));
        assertEquals("a shared database is a PostgreSQL one: give its address as jdbc:postgresql://host:port/name,"
                + " not jdbc:mysql://127.0.0.1/x", e.getMessage());
    }

    @Test
    void theScriptsReadAsPostgresqlSpellsTheirTypes() {
        for (var e : Migrations.read().entrySet()) {
            String pg = Migrations.toPostgresql(e.getValue());
            assertFalse(pg.contains("BINARY LARGE OBJECT"), e.getKey());
        }
        assertEquals("ALTER TABLE t ADD COLUMN b BYTEA;",
                Migrations.toPostgresql("ALTER TABLE t ADD COLUMN b BINARY LARGE OBJECT;"));
    }
}
