package dev.dowser.desk;

import dev.dowser.TestSupport;
import dev.dowser.rounds.RoundWorkers;
import dev.dowser.store.Database;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.io.TempDir;

/**
 * What the desk's service tests stand on: pool "p" (an id and one number x; classes a and b) in a
 * fresh database, behind round workers on the quick sampler that watch nothing, so no round starts
 * unless a test asks and each state stays as the test set it.
 */
abstract class PoolFixture {

    @TempDir
    Path dir;
    Database db;
    RoundWorkers rounds;

    /** The pool's records as CSV under the header {@code id,x}. */
    abstract String records();

    @BeforeEach
    void openPool() {
        db = TestSupport.openDb(dir.resolve("db"));
        rounds = new RoundWorkers(db, TestSupport.quickSampler());
        TestSupport.importText(db, "p", "id,x\n" + records(), TestSupport.csv("p").withId("id")
                .withClasses(List.of("a", "b")));
    }

    @AfterEach
    void closePool() {
        rounds.close();
        db.close();
    }
}
