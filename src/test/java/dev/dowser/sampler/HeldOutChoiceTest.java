package dev.dowser.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.data.LabelledSet;
import dev.dowser.stats.SeedTree;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The prior and temperature chosen on held-out rows, on Fisher's iris (scikit-learn's copy). */
class HeldOutChoiceTest {

    @TempDir
    Path dir;

    /** A quick sampler: the choice's logic does not depend on how long the chains run. */
    private static final SamplerConfig QUICK = SamplerConfig.builder().burnInSteps(300).chains(2, 16).build();

    @Test
    void aPriorThatCannotFitLosesOnTheHeldOutRows() {
        // s = 0.01 pins every weight near 0, so each class gets probability near 1/3 (NLL ln 3 = 1.10
        // on held-out rows); the default prior fits iris (NLL near 0.1). The choice must see that.
        LabelledSet iris = TestSupport.labelledOpenDataset("iris", dir);
        HeldOutChoice choice = new HeldOutChoice(List.of(new HeldOutChoice.Candidate(0.01, 0.1),
                new HeldOutChoice.Candidate(3, 0.1)), 0.15, 15, 200);
        HeldOutChoice.Chosen c = choice.sample(QUICK, iris.x(), iris.labels(), 3, new float[0], SeedTree.of(1));
        assertEquals(3.0, c.config().prior().weightScale(), c.why());
        assertEquals(1.0, c.config().prior().biasScale(), 1e-12, "the bias scale keeps the default ratio");
        assertEquals(200, c.config().steps().mapSteps());
        assertEquals(2, c.heldOutNll().length);
        assertTrue(c.heldOutNll()[0] > 0.9 && c.heldOutNll()[1] < 0.4, Arrays.toString(c.heldOutNll()));
        assertTrue(c.why().startsWith("s 3.00 at T 0.100 gave the 24 held-out rows the lowest NLL"), c.why());
        assertEquals(16, c.draws().draws().size());
    }

    @Test
    void tooFewHeldOutRowsKeepTheConfiguredPrior() {
        LabelledSet iris = TestSupport.labelledOpenDataset("iris", dir);
        int[] some = new int[30];
        for (int i = 0; i < some.length; i++) {
            some[i] = i * 5;
        }
        LabelledSet few = iris.subset(some);
        HeldOutChoice.Chosen c = HeldOutChoice.defaults().sample(QUICK, few.x(), few.labels(), 3, new float[0],
                SeedTree.of(1));
        assertEquals(QUICK.prior(), c.config().prior());
        assertEquals(QUICK.temperature(), c.config().temperature());
        assertEquals(0, c.heldOutNll().length);
        assertEquals("30 labelled rows hold out only 6 (at least 15 are needed to compare candidates), so the"
                + " configured prior and temperature are kept", c.why());
    }

    @Test
    void aConfigurationThatCannotWorkSaysWhatToChange() {
        assertEquals("give at least one candidate, e.g. " + HeldOutChoice.DEFAULT_CANDIDATES,
                assertThrows(IllegalArgumentException.class, () -> new HeldOutChoice(List.of(), 0.15, 15, 0))
                        .getMessage());
        assertEquals("heldOutFraction must lie between 0 and 0.5 (the candidates need most rows to learn from),"
                + " got 0.6", assertThrows(IllegalArgumentException.class,
                () -> new HeldOutChoice(HeldOutChoice.DEFAULT_CANDIDATES, 0.6, 15, 0)).getMessage());
        assertEquals("a candidate's temperature must be positive and finite, got 0.0; 1 samples the true posterior",
                assertThrows(IllegalArgumentException.class, () -> new HeldOutChoice.Candidate(3, 0)).getMessage());
    }
}
