package dev.dowser.rounds;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.acquire.Pickers;
import dev.dowser.acquire.Picks;
import dev.dowser.acquire.PoolScorer;
import dev.dowser.acquire.TypiClust;
import dev.dowser.data.LabelledSet;
import dev.dowser.model.Activation;
import dev.dowser.model.Architecture;
import dev.dowser.model.Layout;
import dev.dowser.model.Prior;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** The batch a strategy picks from scored candidates, BatchBALD's shortlist gathered from the candidates' rows. */
class BatchPickerTest {

    static final int ROWS = 300;
    static final int INPUTS = 5;
    /** No labels yet: BatchBALD does not look at them. */
    static final LabelledSet NONE = new LabelledSet(new float[0], new int[0], new long[0], INPUTS, List.of("a", "b", "c"));

    /** 16 prior draws of a 5-8-3 network and ROWS standard-normal records, scored; drawn from {@code rng} in that order. */
    private record Pool(Layout layout, List<float[]> draws, float[] x, PoolScorer.Result scores) {
        static Pool random(SplittableRandom rng) {
            Layout layout = new Layout(new Architecture(INPUTS, List.of(8), 3, Activation.TANH));
            List<float[]> draws = new ArrayList<>();
            for (int s = 0; s < 16; s++) {
                draws.add(Prior.start(layout, rng));
            }
            float[] x = new float[ROWS * INPUTS];
            for (int i = 0; i < x.length; i++) {
                x[i] = (float) rng.nextGaussian();
            }
            try (PoolScorer scorer = new PoolScorer(1, 64)) {
                return new Pool(layout, draws, x, scorer.score(layout, draws, x, ROWS));
            }
        }
    }

    @Test
    void batchBaldStartsWithTheTopBaldCandidateAndPicksDistinctShortlistedRows() {
        SplittableRandom rng = new SplittableRandom(11);
        Pool pool = Pool.random(rng);
        Layout layout = pool.layout();
        List<float[]> draws = pool.draws();
        float[] x = pool.x();
        PoolScorer.Result scores = pool.scores();
        int[] byBald = Pickers.topB(scores.bald(), ROWS);

        // The joint mutual information of one record is its BALD score, so BatchBALD's first pick is
        // BALD's first (Kirsch, van Amersfoort & Gal 2019, section 3); a wrongly gathered shortlist
        // would score other records' probabilities.
        Picks one = BatchPicker.pick(Strategy.BATCHBALD, 1, scores, x, NONE, layout, draws, new SplittableRandom(1));
        assertArrayEquals(new int[] {byBald[0]}, one.positions());

        int b = 4;
        Picks batch = BatchPicker.pick(Strategy.BATCHBALD, b, scores, x, NONE, layout, draws, new SplittableRandom(1));
        int[] picked = batch.positions();
        assertEquals(b, picked.length);
        assertEquals(byBald[0], picked[0]);
        assertEquals(b, Arrays.stream(picked).distinct().count(), Arrays.toString(picked));
        List<Integer> shortlist = Arrays.stream(byBald, 0, b * BatchPicker.BATCHBALD_CANDIDATES_PER_SLOT).boxed()
                .toList();
        for (int p : picked) {
            assertTrue(shortlist.contains(p), p + " is not among the " + shortlist.size() + " best by BALD");
        }
    }

    @Test
    void typiclustPowerPicksTypicalRecordsBelowTenLabelsPerClassAndPowerSamplesFromThere() {
        SplittableRandom rng = new SplittableRandom(3);
        Pool pool = Pool.random(rng);
        Layout layout = pool.layout();
        List<float[]> draws = pool.draws();
        float[] x = pool.x();
        PoolScorer.Result scores = pool.scores();
        int b = 5;
        for (int labels : new int[] {3, 29, 30, 45}) {
            float[] lx = new float[labels * INPUTS];
            for (int i = 0; i < lx.length; i++) {
                lx[i] = (float) rng.nextGaussian();
            }
            LabelledSet known = new LabelledSet(lx, new int[labels], new long[labels], INPUTS, List.of("a", "b", "c"));
            Picks picks = BatchPicker.pick(Strategy.TYPICLUST_POWER, b, scores, x, known, layout, draws,
                    new SplittableRandom(labels));
            Picks expected = labels < 30
                    ? Picks.greedy(TypiClust.nextBatch(lx, labels, x, ROWS, INPUTS, b, new SplittableRandom(labels)))
                    : BatchPicker.pick(Strategy.POWER, b, scores, x, known, layout, draws, new SplittableRandom(labels));
            assertArrayEquals(expected.positions(), picks.positions(), labels + " labels over 3 classes");
            assertArrayEquals(expected.probabilities(), picks.probabilities(), 0, labels + " labels over 3 classes");
        }
    }

    @Test
    void typiclustMixPassesTypiClustsBatchAndTheScoresToTheMixedPicker() {
        SplittableRandom rng = new SplittableRandom(5);
        Pool pool = Pool.random(rng);
        int labels = 12;
        float[] lx = new float[labels * INPUTS];
        for (int i = 0; i < lx.length; i++) {
            lx[i] = (float) rng.nextGaussian();
        }
        LabelledSet known = new LabelledSet(lx, new int[labels], new long[labels], INPUTS, List.of("a", "b", "c"));
        int b = 6;
        Picks picks = BatchPicker.pick(Strategy.TYPICLUST_MIX, b, pool.scores(), pool.x(), known, pool.layout(),
                pool.draws(), new SplittableRandom(8));
        SplittableRandom same = new SplittableRandom(8);
        Picks expected = TypiClust.mixed(TypiClust.nextBatch(lx, labels, pool.x(), ROWS, INPUTS, b, same), pool.scores(),
                b, BatchPicker.POWER_BETA, same);
        assertArrayEquals(expected.positions(), picks.positions());
        assertArrayEquals(expected.probabilities(), picks.probabilities(), 0);
        assertEquals(b, Arrays.stream(picks.positions()).distinct().count(), Arrays.toString(picks.positions()));
    }
}
