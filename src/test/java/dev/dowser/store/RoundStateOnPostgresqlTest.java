package dev.dowser.store;

import dev.dowser.PostgresServer;
import java.time.Clock;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;

/** Every test of {@link RoundStateStoreTest}, on a real PostgreSQL server ({@link PostgresServer}). */
class RoundStateOnPostgresqlTest extends RoundStateStoreTest {

    static PostgresServer server;

    @BeforeAll
    static void startServer() throws Exception {
        server = PostgresServer.start();
    }

    @AfterAll
    static void stopServer() throws Exception {
        if (server != null) {
            server.close();
        }
    }

    @Override
    Database database(Clock clock) {
        return server.open(clock);
    }
}
