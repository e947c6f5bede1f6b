package dev.dowser.store;

import dev.dowser.TestSupport;
import dev.dowser.labels.LabelRow;
import dev.dowser.labels.Resolution;
import dev.dowser.labels.Verdict;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;

/** How people's labels and reviews give a record's final label, all from appended rows. */
class ResolutionTest {

    @TempDir
    Path dir;
    final TestSupport.MutableClock clock = new TestSupport.MutableClock();
    Database db;
    long pool;

    @BeforeEach
    void open() {
        db = database(clock);
        TestSupport.importText(db, "p", "x\n1\n2\n3\n", TestSupport.csv("p").withClasses(List.of("a", "b", "c")));
        pool = db.pools().require("p").id();
    }

    @AfterEach
    void close() {
        db.close();
    }

    /** The database the tests run on: an H2 file here, a PostgreSQL server in {@code ResolutionOnPostgresqlTest}. */
    Database database(java.time.Clock clock) {
        return Database.open(dir, clock);
    }

    private void label(long row, String label, String by) {
        clock.advance(Duration.ofSeconds(1));
        db.labels().add(pool, row, label, by, null);
    }

    /** A retried label (the same class and note while the person's label stands) writes nothing; H2 and PostgreSQL alike. */
    @Test
    void theSameLabelAgainIsNotAppended() {
        clock.advance(Duration.ofSeconds(1));
        assertEquals(true, db.labels().add(pool, 2, "a", "ana", "n").appended());
        clock.advance(Duration.ofSeconds(1));
        LabelStore.Added again = db.labels().add(pool, 2, "a", "ana", "n");
        assertEquals(false, again.appended(), "a retry was appended");
        assertEquals(1, db.labels().history(pool, 2).size());
        assertEquals(true, db.labels().add(pool, 2, "a", "ana", null).appended(), "a changed note is a new label");
        db.labels().withdraw(pool, 2, "ana");
        assertEquals(true, db.labels().add(pool, 2, "a", "ana", null).appended(), "a label after an undo is a new label");
        assertEquals(4, db.labels().history(pool, 2).size());
    }

    @Test
    void onePersonAgreeingPeopleAndAReviewer() {
        label(0, "a", "ana");
        assertEquals(Resolution.Status.SINGLE, db.labels().resolution(pool, 0).status());
        label(0, "b", "ana");
        assertEquals("b", db.labels().resolution(pool, 0).finalLabel().label(), "a person's newer label replaces theirs");
        label(0, "b", "ben");
        Resolution agreed = db.labels().resolution(pool, 0);
        assertEquals(Resolution.Status.AGREED, agreed.status());
        assertEquals("ana & ben", agreed.finalLabel().labelledBy());

        label(1, "a", "ana");
        label(1, "c", "ben");
        Resolution split = db.labels().resolution(pool, 1);
        assertEquals(Resolution.Status.UNRESOLVED, split.status());
        assertNull(split.finalLabel());
        ConflictException accept = assertThrows(ConflictException.class,
                () -> db.labels().review(pool, 1, "rey", Verdict.ACCEPT, null, null));
        assertEquals("people disagree on this record; override it with the label you choose and a reason",
                accept.getMessage());
        assertEquals("an override needs a reason, kept with the label", assertThrows(IllegalArgumentException.class,
                () -> db.labels().review(pool, 1, "rey", Verdict.OVERRIDE, "c", " ")).getMessage());
        Resolution decided = db.labels().review(pool, 1, "rey", Verdict.OVERRIDE, "c", "scale reads 7.2");
        assertEquals(Resolution.Status.REVIEWED, decided.status());
        assertEquals("c", decided.finalLabel().label());
        assertEquals("rey", decided.finalLabel().labelledBy());
        // A later label does not undo the reviewer's decision.
        label(1, "a", "cy");
        assertEquals("c", db.labels().resolution(pool, 1).finalLabel().label());

        // The training set and the counts read final labels only.
        assertEquals(Map.of("b", 1L, "c", 1L), db.labels().counts(pool));
        // Withdrawing one's label leaves the other person's.
        db.labels().withdraw(pool, 0, "ben");
        assertEquals(Resolution.Status.SINGLE, db.labels().resolution(pool, 0).status());
        // Nothing was changed in place: every step is a row of the history.
        List<LabelStore.Entry> history = db.labels().history(pool, 1);
        assertEquals(List.of("label", "label", "override", "label"), history.stream().map(LabelStore.Entry::kind).toList());
        assertEquals(4, db.labels().history(pool, 0).size());
    }
}
