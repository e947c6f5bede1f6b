package dev.dowser.data;

import dev.dowser.PostgresServer;
import dev.dowser.TestSupport;
import dev.dowser.store.Database;
import java.nio.file.Path;
import org.junit.jupiter.api.extension.RegisterExtension;

/** Every test of {@link ExportRoundTripTest}, on a real PostgreSQL server ({@link PostgresServer}). */
class ExportRoundTripOnPostgresqlTest extends ExportRoundTripTest {

    @RegisterExtension
    static final PostgresServer.ForClass PG = new PostgresServer.ForClass();

    @Override
    Database database(Path data) {
        return PG.server().open(data, TestSupport.CLOCK);
    }
}
