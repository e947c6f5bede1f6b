package dev.dowser.team;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import dev.dowser.TestSupport;
import dev.dowser.labels.Verdict;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import dev.dowser.store.PredictionStore;
import dev.dowser.store.QueueEntry;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The review page's filters, each on a record built to pass exactly that one. */
class ReviewsTest {

    @TempDir
    Path dir;
    Database db;
    PoolRow pool;
    Reviews reviews;

    @BeforeEach
    void open() {
        db = TestSupport.openDb(dir);
        TestSupport.importText(db, "p", "x\n1\n2\n3\n4\n5\n", TestSupport.csv("p").withClasses(List.of("a", "b")));
        pool = db.pools().require("p");
        reviews = new Reviews(db);
        long id = pool.id();
        db.labels().add(id, 0, "a", "ana", null);                 // single, model agrees
        db.labels().add(id, 1, "a", "ana", null);                 // people disagree
        db.labels().add(id, 1, "b", "ben", null);
        db.labels().add(id, 2, "b", "ben", null);                 // a confident model says a
        db.labels().add(id, 3, "a", "ana", null);                 // a spot check
        db.predictions().replace(id, new PredictionStore.Predictions(2, new long[] {0, 1, 2, 3},
                new float[] {0.95f, 0.05f, 0.5f, 0.5f, 0.93f, 0.07f, 0.89f, 0.11f}, 2));
        db.queues().publish(id, 1, List.of(new QueueEntry(1, 0, 3, 0, true, null, null, null)));
    }

    @AfterEach
    void close() {
        db.close();
    }

    private List<Long> rows(Reviews.Show show, String labeller, String label) {
        return reviews.find(pool.name(), new Reviews.Filter(show, labeller, label), 0, 50).items().stream()
                .map(i -> i.resolution().row()).toList();
    }

    /** The id of the record at {@code row}. */
    private String id(long row) {
        return db.records().page(pool.id(), row, 1).get(0).key();
    }

    @Test
    void eachFilterFindsItsRecords() {
        assertEquals(List.of(0L, 1L, 2L, 3L), rows(Reviews.Show.ALL, null, null));
        assertEquals(List.of(1L), rows(Reviews.Show.DISAGREE, null, null));
        assertEquals(List.of(1L), rows(Reviews.Show.UNRESOLVED, null, null));
        assertEquals(List.of(2L), rows(Reviews.Show.MODEL, null, null), "0.89 is not confident enough");
        assertEquals(List.of(3L), rows(Reviews.Show.SPOT, null, null));
        assertEquals(List.of(1L, 2L), rows(Reviews.Show.ALL, "ben", null));
        assertEquals(List.of(1L, 2L), rows(Reviews.Show.ALL, null, "b"));
        assertEquals(2, reviews.find(pool.name(), new Reviews.Filter(Reviews.Show.ALL, null, null), 1, 2).items().size());
        assertEquals(4, reviews.find(pool.name(), new Reviews.Filter(Reviews.Show.ALL, null, null), 1, 2).total());
        assertEquals(List.of("ana", "ben"), reviews.find(pool.name(), new Reviews.Filter(Reviews.Show.SPOT, null, null), 0, 5)
                .people(), "everyone who labelled, whatever the filter");

        // Overriding the disagreement resolves it but it stays findable as one.
        reviews.decide(pool.name(), id(1), new Caller("rey", Role.REVIEWER, null, null), Verdict.OVERRIDE, "b", "clear b");
        assertEquals(List.of(), rows(Reviews.Show.UNRESOLVED, null, null));
        assertEquals(List.of(1L), rows(Reviews.Show.DISAGREE, null, null));
        // Accepting the model's view by overriding ends the model filter's hit.
        reviews.decide(pool.name(), id(2), new Caller("rey", Role.REVIEWER, null, null), Verdict.OVERRIDE, "a",
                "the model is right");
        assertEquals(List.of(), rows(Reviews.Show.MODEL, null, null));
    }

    @Test
    void badFiltersAndDecisionsAreNamed() {
        assertEquals("unknown filter 'odd': use all, disagree, unresolved, model or spot",
                assertThrows(IllegalArgumentException.class, () -> Reviews.Show.parse("odd")).getMessage());
        assertEquals("'z' is not one of the classes a, b", assertThrows(IllegalArgumentException.class,
                () -> rows(Reviews.Show.ALL, null, "z")).getMessage());
        assertEquals("an override needs the label you choose", assertThrows(IllegalArgumentException.class,
                () -> reviews.decide(pool.name(), id(1), new Caller("rey", Role.REVIEWER, null, null),
                        Verdict.OVERRIDE, null, "why")).getMessage());
    }
}
