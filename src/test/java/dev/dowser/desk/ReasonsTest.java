package dev.dowser.desk;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.dowser.data.QueuedBelief;
import dev.dowser.rounds.Strategy;
import dev.dowser.store.QueueEntry;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * "Why this record" in plain words (issue 14): what kind of place it is, and for a picked record
 * what the model's draws believe of it and how far they disagree, never a bare score.
 */
class ReasonsTest {

    static final List<String> CLASSES = List.of("ok", "worn", "blocked");
    /** The draws' mean and spread for a record the model hesitates over between blocked and ok. */
    static final String BELIEF = QueuedBelief.write(new float[] {0.27f, 0.25f, 0.48f}, new float[] {0.2f, 0.1f, 0.31f});

    private static QueueEntry entry(double score, boolean spotCheck, String belief, int copies) {
        return new QueueEntry(3, 0, 17, score, spotCheck, belief, null, null, copies, null);
    }

    @Test
    void aPickedRecordSaysWhatTheDrawsBelieveAndHowFarTheyDisagree() {
        // ln 3 = 1.099 nats is the most a label of three classes can tell: 0.93 is strongly, 0.10 is clearly.
        assertEquals("Picked because the model's posterior draws disagree strongly about it: on average its draws give"
                + " blocked 48% and ok 27%; single draws put blocked about 31 points either side of that (information"
                + " 0.93 nats). A label here teaches the model most.",
                Reasons.why(entry(0.93, false, BELIEF, 1), Strategy.BALD, CLASSES, false));
        assertEquals("Picked because the model's posterior draws disagree about it: on average its draws give blocked"
                + " 48% and ok 27%; single draws put blocked about 31 points either side of that (information 0.10"
                + " nats). A label here teaches the model most.",
                Reasons.why(entry(0.10, false, BELIEF, 1), Strategy.POWER, CLASSES, false));
        assertEquals("Picked because the model's posterior draws differ a little about it: on average its draws give"
                + " blocked 48% and ok 27%; single draws put blocked about 31 points either side of that (information"
                + " 0.05 nats). A label here teaches the model most.",
                Reasons.why(entry(0.05, false, BELIEF, 1), Strategy.BATCHBALD, CLASSES, false));
    }

    @Test
    void eachStrategySaysItsOwnReason() {
        String view = "on average its draws give blocked 48% and ok 27%; single draws put blocked about 31 points"
                + " either side of that.";
        assertEquals("Picked because the model is unsure which class it is: " + view,
                Reasons.why(entry(0.5, false, BELIEF, 1), Strategy.ENTROPY, CLASSES, false));
        assertEquals("Picked because the model's two likeliest classes for it are close: " + view,
                Reasons.why(entry(0.5, false, BELIEF, 1), Strategy.MARGIN, CLASSES, false));
        assertEquals("Picked at random (the pool's strategy): " + view,
                Reasons.why(entry(0.5, false, BELIEF, 1), Strategy.RANDOM, CLASSES, false));
    }

    @Test
    void typiclustPowerSaysWhenAPickIsATypicalRecordRatherThanADisagreement() {
        // Below 10 labels per class the round picks typical records outright (probability 1); after, power samples.
        QueueEntry typical = new QueueEntry(3, 0, 17, 0.10, false, BELIEF, null, null, 1, 1.0, 1, false);
        assertEquals("Picked as the most typical record of a part of the pool that has no label yet: while labels are"
                + " few, covering the common cases teaches the model most. On average its draws give blocked 48% and ok"
                + " 27%; single draws put blocked about 31 points either side of that.",
                Reasons.why(typical, Strategy.TYPICLUST_POWER, CLASSES, false));
        QueueEntry sampled = new QueueEntry(3, 0, 17, 0.10, false, BELIEF, null, null, 1, 0.02, 1, false);
        assertEquals(Reasons.why(sampled, Strategy.POWER, CLASSES, false),
                Reasons.why(sampled, Strategy.TYPICLUST_POWER, CLASSES, false));
        // typiclust-mix picks the typical records it is unsure of outright and power samples the rest.
        assertEquals(Reasons.why(typical, Strategy.TYPICLUST_POWER, CLASSES, false),
                Reasons.why(typical, Strategy.TYPICLUST_MIX, CLASSES, false));
        assertEquals(Reasons.why(sampled, Strategy.POWER, CLASSES, false),
                Reasons.why(sampled, Strategy.TYPICLUST_MIX, CLASSES, false));
    }

    @Test
    void spotChecksFirstBatchesAndSecondOpinionsSayWhatTheyAre() {
        assertEquals("First batch: picked to cover the pool before the model has labels to learn from.",
                Reasons.why(entry(0, false, null, 1), Strategy.BALD, CLASSES, false));
        assertEquals("First batch: picked to cover the pool before the model has labels to learn from. Two people"
                + " label this one, neither seeing the other's label.",
                Reasons.why(entry(0, false, null, 2), Strategy.BALD, CLASSES, false));
        // Before any model there is no belief to keep hidden.
        assertEquals("Spot check: picked at random, so that the model's accuracy is measured without the bias of"
                + " picking.", Reasons.why(entry(0, true, null, 1), Strategy.BALD, CLASSES, false));
        assertEquals("Spot check: picked at random, so that the model's accuracy is measured without the bias of"
                + " picking; its belief stays hidden until you ask.",
                Reasons.why(entry(0.4, true, BELIEF, 1), Strategy.BALD, CLASSES, false));
        // A record carried into a later queue for its second label is not given the reason it was first picked for.
        assertEquals("Second opinion: someone has labelled this record already; label it as you see it. The two labels"
                + " show how far people agree.", Reasons.why(entry(0.93, false, BELIEF, 2), Strategy.BALD, CLASSES, true));
    }
}
