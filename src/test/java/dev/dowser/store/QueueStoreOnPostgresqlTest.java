package dev.dowser.store;

import dev.dowser.PostgresServer;
import java.time.Clock;
import org.junit.jupiter.api.extension.RegisterExtension;

/** Every test of {@link QueueStoreTest}, on a real PostgreSQL server ({@link PostgresServer}). */
class QueueStoreOnPostgresqlTest extends QueueStoreTest {

    @RegisterExtension
    static final PostgresServer.ForClass PG = new PostgresServer.ForClass();

    @Override
    Database database(Clock clock) {
        return PG.server().open(clock);
    }
}
