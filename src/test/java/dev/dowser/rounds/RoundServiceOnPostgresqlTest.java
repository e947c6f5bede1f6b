package dev.dowser.rounds;

import dev.dowser.PostgresServer;
import dev.dowser.TestSupport;
import dev.dowser.store.Database;
import java.nio.file.Path;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;

/** Every test of {@link RoundServiceTest}, on a real PostgreSQL server ({@link PostgresServer}). */
class RoundServiceOnPostgresqlTest extends RoundServiceTest {

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
    Database database(Path data) {
        return server.open(data, TestSupport.CLOCK);
    }
}
