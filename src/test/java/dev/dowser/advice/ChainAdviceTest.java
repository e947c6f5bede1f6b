package dev.dowser.advice;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.sampler.Diagnostics;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * Chain advice on chains of known behaviour: independent normal draws (ideal chains), AR(1)
 * chains with a known autocorrelation, and chains centred apart (modes).
 */
class ChainAdviceTest {

    private static final ChainAdvice.Knobs KNOBS = new ChainAdvice.Knobs(4, 64, 300, 16, 512, 5_000);
    /** As the rounds judge them: the worst of the log-likelihood and 8 probe rows. */
    private static final int SUMMARIES = 9;

    /** m chains of n draws of an AR(1) process x_t = rho x_{t-1} + e_t, chain j centred at offset * j. */
    private static double[][] chains(SplittableRandom rng, int m, int n, double rho, double offset) {
        double[][] out = new double[m][n];
        for (int j = 0; j < m; j++) {
            double x = rng.nextGaussian() / Math.sqrt(1 - rho * rho);
            for (int t = 0; t < n; t++) {
                x = rho * x + rng.nextGaussian();
                out[j][t] = x * Math.sqrt(1 - rho * rho) + offset * j;
            }
        }
        return out;
    }

    private static ChainAdvice judge(SplittableRandom rng, double rho, double offset) {
        double rhat = 0;
        double bulk = Double.POSITIVE_INFINITY;
        double tail = Double.POSITIVE_INFINITY;
        for (int k = 0; k < SUMMARIES; k++) {
            double[][] c = chains(rng, 4, 16, rho, offset);
            rhat = Math.max(rhat, Diagnostics.rhat(c));
            bulk = Math.min(bulk, Diagnostics.essBulk(c));
            tail = Math.min(tail, Diagnostics.essTail(c));
        }
        return ChainAdvice.of(rhat, bulk, tail, 4, 64, KNOBS);
    }

    @Test
    void idealChainsReadHealthy() {
        // Independent draws are what a perfect sampler gives: the advice must stay quiet on at
        // least 99% of 400 such rounds of 4 chains x 16 draws (the app's default 64 draws).
        SplittableRandom rng = new SplittableRandom(31);
        int good = 0;
        for (int t = 0; t < 400; t++) {
            good += ChainAdvice.Level.GOOD == judge(rng, 0, 0).level() ? 1 : 0;
        }
        System.out.println("ideal chains read healthy in " + good + " of 400");
        assertTrue(good >= 396, "healthy in " + good + " of 400");
    }

    @Test
    void stronglyCorrelatedDrawsAskForMoreDraws() {
        // rho = 0.97: the integrated autocorrelation time is (1 + rho) / (1 - rho) = 66, so 64
        // draws are worth about one each chain, far under 0.1 x 64.
        ChainAdvice a = judge(new SplittableRandom(32), 0.97, 0);
        assertEquals(ChainAdvice.Level.ACT, a.level());
        assertEquals("draws", a.points().get(0).setting());
        assertEquals(128, a.points().get(0).suggest());
        assertTrue(a.points().get(0).text().startsWith("The 64 draws behave like about "), a.points().get(0).text());
    }

    @Test
    void chainsInDifferentModesAreANoteWithTheExplanationsSentence() {
        // Chains centred 3 standard deviations apart and otherwise independent: between-chain spread.
        ChainAdvice a = judge(new SplittableRandom(33), 0, 3);
        assertTrue(a.points().stream().anyMatch(p -> p.text().contains(ChainAdvice.EXPLANATIONS)), a.toString());
        assertTrue(a.points().stream().anyMatch(p -> "chains".equals(p.setting()) && p.suggest() == 8), a.toString());
    }

    @Test
    void nothingIsAskedThatNoSettingAllows() {
        ChainAdvice.Knobs maxed = new ChainAdvice.Knobs(16, 512, 5_000, 16, 512, 5_000);
        ChainAdvice a = ChainAdvice.of(2.0, 3, 3, 16, 512, maxed);
        assertEquals(ChainAdvice.Level.NOTE, a.level());
        assertTrue(a.points().stream().allMatch(p -> p.setting() == null), a.toString());
    }

    @Test
    void thresholdsFollowTheDrawsKept() {
        // 4 chains x 1,000 draws (Stan's default): ESS 400 and R-hat 1.005, near Vehtari et al.'s
        // (2021) 400 and 1.01; 64 draws: ESS 6.4 and R-hat sqrt(1 + 4 / 6.4) = 1.275.
        assertEquals(400, ChainAdvice.essFloor(4000), 1e-9);
        assertEquals(Math.sqrt(1.01), ChainAdvice.rhatCeiling(4, 4000), 1e-12);
        assertEquals(6.4, ChainAdvice.essFloor(64), 1e-9);
        assertEquals(Math.sqrt(1 + 4 / 6.4), ChainAdvice.rhatCeiling(4, 64), 1e-12);
    }

    /** The advice from the across- and within-chain figures of 9 summaries, as the rounds judge them. */
    private static ChainAdvice judgeSplit(SplittableRandom rng, double offset, double trend) {
        double rhat = 0;
        double bulk = Double.POSITIVE_INFINITY;
        double tail = Double.POSITIVE_INFINITY;
        double within = 0;
        double essWithin = Double.POSITIVE_INFINITY;
        for (int k = 0; k < SUMMARIES; k++) {
            double[][] c = chains(rng, 4, 16, 0, offset);
            for (double[] chain : c) {
                for (int t = 0; t < chain.length; t++) {
                    chain[t] += trend * t / chain.length;
                }
            }
            rhat = Math.max(rhat, Diagnostics.rhat(c));
            bulk = Math.min(bulk, Diagnostics.essBulk(c));
            tail = Math.min(tail, Diagnostics.essTail(c));
            within = Math.max(within, Diagnostics.rhatWithin(c));
            essWithin = Math.min(essWithin, Diagnostics.essWithin(c));
        }
        return ChainAdvice.of(rhat, bulk, tail, within, essWithin, 4, 64, KNOBS);
    }

    @Test
    void chainsSettledInSeparateModesAreANoteNotACallToAct() {
        // Independent draws about centres 3 SD apart: each chain mixes, the chains disagree. On
        // most of 100 such rounds (across-chain ESS alone would say "act": it counts about 4
        // draws) the advice must be a note naming modes, never an act.
        SplittableRandom rng = new SplittableRandom(34);
        int notes = 0;
        for (int t = 0; t < 100; t++) {
            ChainAdvice a = judgeSplit(rng, 3, 0);
            assertTrue(a.level() != ChainAdvice.Level.ACT || a.points().stream()
                    .noneMatch(p -> p.text().contains(ChainAdvice.MODES)), a.toString());
            notes += a.level() == ChainAdvice.Level.NOTE
                    && a.points().stream().anyMatch(p -> p.text().contains(ChainAdvice.MODES)) ? 1 : 0;
        }
        System.out.println("separate modes read as a note in " + notes + " of 100");
        assertTrue(notes >= 95, "a note in " + notes + " of 100");
    }

    @Test
    void chainsStillDriftingAskForALongerWarmUp() {
        // Each chain's mean climbs 4 SD over its 16 draws: its halves disagree.
        ChainAdvice a = judgeSplit(new SplittableRandom(35), 0, 4);
        assertEquals(ChainAdvice.Level.ACT, a.level(), a.toString());
        assertEquals("reburn_in_steps", a.points().get(0).setting(), a.toString());
        assertEquals(600, a.points().get(0).suggest());
        assertTrue(a.points().get(0).text().startsWith("Some chains were still moving while they drew"), a.toString());
    }
}
