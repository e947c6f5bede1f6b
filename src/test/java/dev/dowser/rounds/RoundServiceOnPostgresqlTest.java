package dev.dowser.rounds;

import dev.dowser.PostgresServer;
import dev.dowser.TestSupport;
import dev.dowser.store.Database;
import java.nio.file.Path;
import org.junit.jupiter.api.extension.RegisterExtension;

/** Every test of {@link RoundServiceTest}, on a real PostgreSQL server ({@link PostgresServer}). */
class RoundServiceOnPostgresqlTest extends RoundServiceTest {

    @RegisterExtension
    static final PostgresServer.ForClass PG = new PostgresServer.ForClass();

    @Override
    Database database(Path data) {
        return PG.server().open(data, TestSupport.CLOCK);
    }
}
