package dev.dowser.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.advice.ChainAdvice;
import dev.dowser.data.LabelledSet;
import dev.dowser.model.Activation;
import dev.dowser.model.Architecture;
import dev.dowser.model.Layout;
import dev.dowser.model.Mlp;
import dev.dowser.model.Prior;
import dev.dowser.stats.SeedTree;
import java.nio.file.Path;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The real sampler's diagnostics where the answer is known. Well specified: labels drawn from a
 * logistic model (the network with no hidden layer) whose weights are drawn from the prior Dowser
 * samples under (weights N(0, (3 / sqrt(fanIn))^2), biases N(0, 1)), sampled at T = 1, the true
 * posterior, which is log-concave and so has one mode: the figures must read healthy by the
 * thresholds of Vehtari et al. (2021): rank-normalised split R-hat below 1.01, bulk and tail ESS
 * above 400 (100 per chain for 4 chains), and the advice must be "good". The same data with no
 * warm-up must fail those thresholds, so the check can fail. Mode-started: chains that climb to
 * separate modes of iris' posterior before they sample (as {@code fit} does) disagree across
 * chains, while each one mixes; the advice must say so, as a note rather than a call to act.
 */
class ChainHealthTest {

    static final int INPUTS = 4;
    static final int CLASSES = 2;
    static final int ROWS = 300;
    static final int PROBE_ROWS = 8;
    /** Vehtari et al. (2021), section 4: R-hat below 1.01 and bulk and tail ESS above 400 for 4 chains. */
    static final double RHAT_HEALTHY = 1.01;
    static final double ESS_HEALTHY = 400;

    /** Rows x ~ N(0, I) and labels drawn from the logistic model with prior-drawn weights. */
    record WellSpecified(float[] x, int[] labels, float[] probe) {

        static WellSpecified draw(long seed) {
            SplittableRandom rng = new SplittableRandom(seed);
            Layout layout = new Layout(new Architecture(INPUTS, List.of(), CLASSES, Activation.RELU));
            Prior prior = Prior.standard();
            float[] truth = new float[layout.dimension()];
            double sd = prior.weightScale() / Math.sqrt(INPUTS);
            for (int i = 0; i < layout.weightCount(0); i++) {
                truth[layout.weightOffset(0) + i] = (float) (sd * rng.nextGaussian());
            }
            for (int k = 0; k < CLASSES; k++) {
                truth[layout.biasOffset(0) + k] = (float) (prior.biasScale() * rng.nextGaussian());
            }
            float[] x = new float[ROWS * INPUTS];
            for (int i = 0; i < x.length; i++) {
                x[i] = (float) rng.nextGaussian();
            }
            float[] p = new float[ROWS * CLASSES];
            new Mlp(layout, ROWS).probabilities(truth, x, 0, ROWS, p);
            int[] labels = new int[ROWS];
            for (int r = 0; r < ROWS; r++) {
                labels[r] = rng.nextDouble() < p[r * CLASSES] ? 0 : 1;
            }
            return new WellSpecified(x, labels, java.util.Arrays.copyOf(x, PROBE_ROWS * INPUTS));
        }
    }

    static SamplerConfig.Builder logistic() {
        return SamplerConfig.builder().hidden(List.of()).temperature(SamplerConfig.TRUE_POSTERIOR_TEMPERATURE)
                .chains(4, 1_000);
    }

    static ChainAdvice advice(Health h, SamplerConfig c) {
        int chains = c.chains().count();
        int draws = c.chains().draws();
        return ChainAdvice.of(h.rhatMax(), h.essBulkMin(), h.essTailMin(), h.rhatWithinMax(), h.essWithinMin(), chains,
                draws, new ChainAdvice.Knobs(chains, draws, 300, 16, 2_000, 5_000));
    }

    @Test
    void wellSpecifiedLogisticPosteriorReadsHealthy() {
        WellSpecified d = WellSpecified.draw(41);
        SamplerConfig c = logistic().build();
        Health h = new PosteriorSampler(c, 2).sample(d.x(), d.labels(), CLASSES, null, d.probe(), SeedTree.of(41))
                .health();
        System.out.println("well specified, T = 1: " + h);
        assertTrue(h.rhatMax() < RHAT_HEALTHY && h.rhatWithinMax() < RHAT_HEALTHY, h.toString());
        assertTrue(h.essBulkMin() > ESS_HEALTHY && h.essTailMin() > ESS_HEALTHY && h.essWithinMin() > ESS_HEALTHY,
                h.toString());
        assertEquals(ChainAdvice.Level.GOOD, advice(h, c).level(), advice(h, c).toString());
    }

    @Test
    void withoutWarmUpTheSameChainsReadUnhealthy() {
        // Every draw kept from the first step, one step apart, from a start far narrower than the
        // posterior: the early draws still climb, so both R-hats and the ESS must fail the thresholds.
        WellSpecified d = WellSpecified.draw(41);
        SamplerConfig c = logistic().burnInSteps(0).thinSteps(1).chains(4, 400).build();
        Health h = new PosteriorSampler(c, 2).sample(d.x(), d.labels(), CLASSES, null, d.probe(), SeedTree.of(41))
                .health();
        System.out.println("no warm-up: " + h);
        assertTrue(h.rhatWithinMax() > RHAT_HEALTHY, h.toString());
        assertTrue(h.essWithinMin() < ESS_HEALTHY, h.toString());
    }

    @TempDir
    Path dir;

    @Test
    void chainsStartedAtSeparateModesReadAsModesNotAsACallToAct() {
        LabelledSet iris = TestSupport.labelledOpenDataset("iris", dir);
        // fit's held-out choice on iris picks this prior most often (calib notes), with the climb.
        SamplerConfig c = SamplerConfig.builder().prior(new Prior(9.49, 3.16, false, Prior.DEFAULT_HYPER_SHAPE))
                .mapSteps(HeldOutChoice.DEFAULT_MAP_STEPS).build();
        float[] probe = java.util.Arrays.copyOf(iris.x(), PROBE_ROWS * (iris.x().length / iris.rows()));
        Health h = new PosteriorSampler(c, 2).sample(iris.x(), iris.labels(), iris.classes().size(), null, probe,
                SeedTree.of(42)).health();
        ChainAdvice a = advice(h, c);
        System.out.println("iris from separate modes: " + h + "\n  " + a);
        double ceiling = ChainAdvice.rhatCeiling(4, 64);
        assertTrue(h.rhatMax() > ceiling, "the chains should sit in different modes: " + h);
        assertTrue(h.rhatWithinMax() < ceiling, "each chain should mix about its own mode: " + h);
        assertEquals(ChainAdvice.Level.NOTE, a.level(), a.toString());
        assertTrue(a.points().stream().anyMatch(p -> p.text().contains(ChainAdvice.MODES)), a.toString());
    }
}
