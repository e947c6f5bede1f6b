package dev.dowser.sampler;

import dev.dowser.blas.RowMajor;
import dev.dowser.model.Prior;
import dev.dowser.stats.Metrics;
import dev.dowser.stats.SeedTree;
import dev.dowser.stats.Splits;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * The prior's width and the posterior's temperature chosen for each labelled set on rows held out
 * of it, rather than once for every data set. No one pair suits all: with every training row
 * labelled (calib notes, split seeds 1-5, test NLL), the pool default s = 3, T = 0.1 is
 * underconfident on digits (0.134) where s = 9.49 gives 0.089, on wine (0.097) where s = 9.49 at
 * T = 0.03 gives 0.053, while it is the best of them on breast cancer (0.073). Each candidate
 * samples the posterior on a stratified share of the labelled rows; the one whose posterior
 * predictive gives the held-out rows the lowest NLL wins and samples again on every row. This is
 * cross-validation of hyperparameters by held-out log likelihood on one split (Stone 1974), the
 * same use of held-out rows as a point estimate's early stopping; on a few dozen held-out rows it
 * is noisy (breast cancer: 0.084 chosen against 0.073 for the default). Every fit's new chains
 * first climb to independently optimised points (Sommer et al. 2024), which a wide prior needs:
 * 2,000 Langevin steps from a random start leave digits' chains short of a good mode (0.106
 * without the climb, 0.089 with it).
 *
 * @param candidates      the pairs to choose from, in order (a tie keeps the earlier one)
 * @param heldOutFraction share of each class's labelled rows held out to score the candidates
 * @param minHeldOutRows  fewer held-out rows than this cannot tell the candidates apart: the
 *                        configured prior and temperature are kept, and {@link Chosen#why} says so
 * @param mapSteps        Adam steps each new chain climbs before it samples, in every fit of the choice
 */
public record HeldOutChoice(List<Candidate> candidates, double heldOutFraction, int minHeldOutRows, int mapSteps) {

    /**
     * One candidate: the weight prior N(0, (s / sqrt(fanIn))^2) with its bias scale in the default
     * prior's ratio to s, sampled at temperature T.
     *
     * @param weightScale s
     * @param temperature T
     */
    public record Candidate(double weightScale, double temperature) {

        public Candidate {
            if (!(weightScale > 0) || Double.isInfinite(weightScale)) {
                throw new IllegalArgumentException("a candidate's weight scale must be positive and finite, got "
                        + weightScale);
            }
            if (!(temperature > 0) || Double.isInfinite(temperature)) {
                throw new IllegalArgumentException("a candidate's temperature must be positive and finite, got "
                        + temperature + "; 1 samples the true posterior");
            }
        }

        @Override
        public String toString() {
            return String.format(Locale.ROOT, "s %.3g at T %.3g", weightScale, temperature);
        }
    }

    /**
     * The default, then wider priors at the same temperature (9.49 = 3 sqrt(10): the default prior
     * untempered, the likelihood alone sharpened), then that prior colder.
     */
    public static final List<Candidate> DEFAULT_CANDIDATES = List.of(
            new Candidate(Prior.DEFAULT_WEIGHT_SCALE, SamplerConfig.DEFAULT_TEMPERATURE),
            new Candidate(6.0, SamplerConfig.DEFAULT_TEMPERATURE),
            new Candidate(9.49, SamplerConfig.DEFAULT_TEMPERATURE),
            new Candidate(9.49, 0.03));
    /** As the point estimate's early stopping holds out (PointEstimateTest). */
    public static final double DEFAULT_HELD_OUT_FRACTION = 0.15;
    public static final int DEFAULT_MIN_HELD_OUT_ROWS = 15;
    public static final int DEFAULT_MAP_STEPS = 2_000;

    public HeldOutChoice {
        if (candidates == null || candidates.isEmpty()) {
            throw new IllegalArgumentException("give at least one candidate, e.g. " + DEFAULT_CANDIDATES);
        }
        candidates = List.copyOf(candidates);
        if (!(heldOutFraction > 0 && heldOutFraction < 0.5)) {
            throw new IllegalArgumentException("heldOutFraction must lie between 0 and 0.5 (the candidates need most"
                    + " rows to learn from), got " + heldOutFraction);
        }
        if (minHeldOutRows < 1) {
            throw new IllegalArgumentException("minHeldOutRows must be at least 1, got " + minHeldOutRows);
        }
        if (mapSteps < 0) {
            throw new IllegalArgumentException("mapSteps must be 0 (no climb to a mode) or more, got " + mapSteps);
        }
    }

    public static HeldOutChoice defaults() {
        return new HeldOutChoice(DEFAULT_CANDIDATES, DEFAULT_HELD_OUT_FRACTION, DEFAULT_MIN_HELD_OUT_ROWS,
                DEFAULT_MAP_STEPS);
    }

    /**
     * The draws of the chosen candidate on every row, its configuration, each candidate's
     * held-out NLL (empty when there were too few rows to choose) and why, in words.
     */
    public record Chosen(RoundDraws draws, SamplerConfig config, double[] heldOutNll, String why) {
    }

    /**
     * Chooses the prior and temperature for {@code base} (every other setting kept) on the labelled
     * rows x (row-major) with {@code labels}, then samples with them on every row. Branch 0 of
     * {@code seeds} splits the rows, branch 1 + i samples candidate i on the kept share, and the
     * branch after the last candidate samples the winner.
     */
    public Chosen sample(SamplerConfig base, float[] x, int[] labels, int classes, float[] probe, SeedTree seeds) {
        int rows = labels.length;
        int cols = x.length / rows;
        Splits.Split split = Splits.stratified(labels, classes, heldOutFraction, seeds.child(0).rng());
        SamplerConfig chosen;
        double[] nll;
        String why;
        if (split.test().length < minHeldOutRows || split.train().length == 0) {
            chosen = base.toBuilder().mapSteps(mapSteps).build();
            nll = new double[0];
            why = String.format(Locale.ROOT, "%d labelled rows hold out only %d (at least %d are needed to compare"
                    + " candidates), so the configured prior and temperature are kept", rows, split.test().length,
                    minHeldOutRows);
        } else {
            float[] keptX = RowMajor.gather(x, cols, split.train());
            int[] keptY = gather(labels, split.train());
            float[] heldX = RowMajor.gather(x, cols, split.test());
            int[] heldY = gather(labels, split.test());
            nll = new double[candidates.size()];
            int best = 0;
            for (int i = 0; i < candidates.size(); i++) {
                RoundDraws d = new PosteriorSampler(config(base, candidates.get(i))).sample(keptX, keptY, classes, null,
                        new float[0], seeds.child(1 + i));
                nll[i] = Metrics.nll(Predictive.meanProbabilities(d.layout(), d.draws(), heldX, heldY.length), heldY,
                        classes);
                if (nll[i] < nll[best]) {
                    best = i;
                }
            }
            chosen = config(base, candidates.get(best));
            why = String.format(Locale.ROOT, "%s gave the %d held-out rows the lowest NLL (%.4f) of %s",
                    candidates.get(best), heldY.length, nll[best], candidates);
        }
        RoundDraws draws = new PosteriorSampler(chosen).sample(x, labels, classes, null, probe,
                seeds.child(1 + candidates.size()));
        return new Chosen(draws, chosen, nll, why);
    }

    /** {@code base} with the candidate's prior and temperature, and the climb. */
    SamplerConfig config(SamplerConfig base, Candidate c) {
        Prior p = base.prior();
        double biasScale = c.weightScale() * Prior.DEFAULT_BIAS_SCALE / Prior.DEFAULT_WEIGHT_SCALE;
        return base.toBuilder()
                .prior(new Prior(c.weightScale(), biasScale, p.hierarchical(), p.hyperShape(), p.tailDegrees()))
                .temperature(c.temperature()).mapSteps(mapSteps).build();
    }

    private static int[] gather(int[] labels, int[] at) {
        int[] out = new int[at.length];
        for (int i = 0; i < at.length; i++) {
            out[i] = labels[at[i]];
        }
        return out;
    }
}
