package dev.dowser.labels;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.Instant;
import java.util.List;
import org.junit.jupiter.api.Test;

/** The final-label rule as pure code: what was said about a record, oldest first, folded into where it stands. */
class ResolutionFoldTest {

    private static Instant t(int s) {
        return Instant.ofEpochSecond(1_800_000_000L + s);
    }

    private static LabelEvent label(String by, String label, int s) {
        return new LabelEvent(7, label, by, t(s), null, false, null);
    }

    private static LabelEvent withdrawal(String by, String label, int s) {
        return new LabelEvent(7, label, by, t(s), null, true, null);
    }

    private static LabelEvent review(String by, Verdict v, String label, String reason, int s) {
        return new LabelEvent(7, label, by, t(s), reason, false, v);
    }

    @Test
    void aNewerLabelReplacesAnOlderOneAndAWithdrawalRemovesIt() {
        Resolution r = Resolution.fold(7, List.of(label("ana", "a", 1), label("ben", "b", 2), label("ana", "b", 3)));
        // ana's newer label replaces hers and moves her opinion last, in the order opinions were last given.
        assertEquals(List.of("ben", "ana"), r.opinions().stream().map(Resolution.Opinion::person).toList());
        assertEquals(Resolution.Status.AGREED, r.status());
        assertEquals("b", r.finalLabel().label());
        assertEquals("ben & ana", r.finalLabel().labelledBy());
        Resolution back = Resolution.fold(7, List.of(label("ana", "a", 1), withdrawal("ana", "a", 2)));
        assertTrue(back.empty(), "a record whose only label was taken back has nothing standing");
        assertNull(back.finalLabel());
    }

    @Test
    void peopleWhoDisagreeWaitForAReviewAndTheNewestReviewIsInForce() {
        List<LabelEvent> split = List.of(label("ana", "a", 1), label("ben", "b", 2));
        assertEquals(Resolution.Status.UNRESOLVED, Resolution.fold(7, split).status());
        assertNull(Resolution.fold(7, split).finalLabel(), "disagreement is never settled by order");
        Resolution decided = Resolution.fold(7, List.of(split.get(0), split.get(1),
                review("rey", Verdict.OVERRIDE, "c", "scale reads 7.2", 3),
                review("ria", Verdict.OVERRIDE, "a", "second look", 4)));
        assertEquals(Resolution.Status.REVIEWED, decided.status());
        assertEquals("a", decided.finalLabel().label());
        assertEquals("ria", decided.finalLabel().labelledBy());
        assertEquals("second look", decided.finalLabel().note());
    }

    @Test
    void verdictsAreWords() {
        assertEquals(Verdict.ACCEPT, Verdict.parse("accept"));
        assertEquals("override", Verdict.OVERRIDE.word());
        assertEquals("unknown verdict 'maybe': use accept or override",
                assertThrows(IllegalArgumentException.class, () -> Verdict.parse("maybe")).getMessage());
    }
}
