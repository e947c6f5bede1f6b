package dev.dowser.rounds;

import dev.dowser.acquire.ColdStart;
import dev.dowser.acquire.Pickers;
import dev.dowser.acquire.Picks;
import dev.dowser.acquire.PoolScorer;
import dev.dowser.acquire.SpotChecks;
import dev.dowser.blas.RowMajor;
import dev.dowser.data.LabelledSet;
import dev.dowser.sampler.PosteriorSampler;
import dev.dowser.sampler.Predictive;
import dev.dowser.sampler.RoundDraws;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.sampler.State;
import dev.dowser.sampler.StopSignal;
import dev.dowser.stats.SeedTree;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import java.util.stream.LongStream;

/**
 * One round, values in and values out: the labelled set (final labels), the chains' states from
 * the round before, the unlabelled candidates, the pool's settings, the sampler's configuration and
 * the round's node of the seed tree go in; the draws, the candidates' scores, the new queue (picks
 * with spot checks mixed in, each with the probability it was picked with and the serving model's
 * belief) and the chains' health come out. Nothing is read or written elsewhere: the server's
 * rounds ({@link RoundService}) and the offline loop ({@link Simulation}) call this same step, so
 * a simulation is what the app does.
 *
 * <p>With no labels yet the round is a cold start: the first batch is spread over the pool.
 */
public final class RoundStep {

    /** Branches of a round's node in the seed tree, one per consumer of random numbers. */
    static final int CHAINS = 0;
    static final int PICK = 1;
    static final int SPOT_CHECKS = 2;
    static final int COPIES = 3;
    static final int RESERVE = 4;
    /** Unlabelled rows whose predictions serve the chains' diagnostics: the first few candidates. */
    static final int PROBE_ROWS = 8;

    private RoundStep() {
    }

    /** Records of a pool: their standardised features, row-major, and their places in the pool. */
    public record Rows(float[] x, long[] rows, int cols) {

        public Rows {
            if (x.length != (long) rows.length * cols) {
                throw new IllegalArgumentException(rows.length + " candidates with " + x.length
                        + " feature values, expected " + cols + " each");
            }
        }

        public int count() {
            return rows.length;
        }
    }

    /**
     * What a round starts from.
     *
     * @param labelled   the records with a final label, in pool order: what the model learns from (its
     *                   {@code poolRows} name records as the candidates' rows do)
     * @param candidates the records nobody has labelled, in pool order: what the round picks from
     * @param judged     the records anyone has labelled, resolved or not, whose predictions the
     *                   round reports (the review page compares them with people's labels)
     * @param chains     where each chain stopped in the round before, or null to start them afresh
     * @param stopSet    the pool's fixed stop set, with the round before's predictions for it
     * @param settings   the pool's picking settings
     * @param sampler    how the posterior is sampled
     * @param seeds      this round's node of the seed tree
     * @param round      the round's number (1 for a pool's first)
     */
    public record Input(LabelledSet labelled, Rows candidates, Rows judged, List<State<?>> chains,
                        Settling.StopSet stopSet, PoolSettings settings, SamplerConfig sampler, SeedTree seeds,
                        int round) {

        public Input {
            if (labelled.cols() != candidates.cols()) {
                throw new IllegalArgumentException("labelled rows have " + labelled.cols()
                        + " features but candidates " + candidates.cols());
            }
            if (judged.cols() != candidates.cols()) {
                throw new IllegalArgumentException("judged rows have " + judged.cols()
                        + " features but candidates " + candidates.cols());
            }
        }
    }

    /**
     * One place of the new queue, in serving order.
     *
     * @param row         the record's place in the pool
     * @param candidate   its position among the candidates
     * @param score       its BALD score (nats; 0 in a cold start)
     * @param spotCheck   drawn uniformly at random rather than picked by score
     * @param probability the probability with which it was picked, given the places picked before
     *                    it: Plackett-Luce for power sampling, 1 / (candidates left) for random
     *                    picks and spot checks, 1 for greedy strategies and the cold start; NaN for
     *                    the reserve, which is ranked, not picked
     * @param order       its place in the round's sequence of picks, 1 first (the picks by score,
     *                    then the spot checks): with {@code probability}, what importance weighting needs;
     *                    0 for the reserve
     * @param copies      how many different people label it (2 to measure their agreement)
     * @param mean        the serving model's mean class probabilities (null in a cold start)
     * @param sd          their spread across the draws (null in a cold start)
     */
    public record Pick(long row, int candidate, double score, boolean spotCheck, double probability, int order,
                       int copies, float[] mean, float[] sd) {
    }

    /**
     * What a round produced.
     *
     * @param queue        the new queue, in serving order
     * @param reserve      the next-best candidates after it, best first ({@link NextBest}), served once
     *                     the queue is taken while the next round runs
     * @param draws        the posterior draws, chains and health; null in a cold start
     * @param kernel       the kernel's word, or {@code none} in a cold start
     * @param why          why this kernel (or the cold start), in words for the person who runs the pool
     * @param judgedMean   the posterior predictive of each judged record (rows x classes); empty in a cold start
     * @param settling     the stop set's predictions and the information left in the pool; null in a cold start
     */
    public record Result(int round, List<Pick> queue, List<Pick> reserve, RoundDraws draws, String kernel, String why,
                         float[] judgedMean, Settling settling) {

        public Result {
            queue = List.copyOf(queue);
            reserve = List.copyOf(reserve);
        }

        public boolean cold() {
            return draws == null;
        }
    }

    public static final String NO_KERNEL = "none";

    /** Runs the round; a raised {@code stop} ends the sampling at a safe point with {@code SamplingStopped}. */
    public static Result run(Input in, PoolScorer scorer, StopSignal stop) {
        Rows cand = in.candidates();
        PoolSettings settings = in.settings();
        int b = Math.min(settings.batchSize(), cand.count());
        SplittableRandom pickRng = in.seeds().child(PICK).rng();
        SplittableRandom spotRng = in.seeds().child(SPOT_CHECKS).rng();
        if (in.labelled().rows() == 0) {
            // Labelling at random means at random from the first record: the baseline gets no cold start's help.
            Picks picks = settings.strategy() == Strategy.RANDOM ? Pickers.uniform(cand.count(), b, pickRng)
                    : Picks.greedy(ColdStart.pick(settings.coldStart(), cand.x(), cand.count(), cand.cols(), b,
                    pickRng));
            List<SpotChecks.Entry> mixed = SpotChecks.mix(picks, cand.count(), b, settings.spotCheckShare(), spotRng);
            List<Pick> queue = new ArrayList<>();
            for (SpotChecks.Entry e : mixed) {
                queue.add(new Pick(cand.rows()[e.candidate()], e.candidate(), 0, e.spotCheck(), e.probability(),
                        e.order(), 1, null, null));
            }
            int[] at = mixed.stream().mapToInt(SpotChecks.Entry::candidate).toArray();
            List<Pick> reserve = new ArrayList<>();
            for (int c : NextBest.ranked(null, cand.count(), at, NextBest.size(b, cand.count() - at.length),
                    in.seeds().child(RESERVE).rng())) {
                reserve.add(new Pick(cand.rows()[c], c, 0, false, Double.NaN, 0, 1, null, null));
            }
            return new Result(in.round(), withCopies(queue, settings.doubleLabelShare(), in), reserve, null, NO_KERNEL,
                    settings.strategy() == Strategy.RANDOM ? "no labels yet: the first batch is drawn at random"
                            : "no labels yet: the first batch is spread over the pool by " + settings.coldStart().word(),
                    new float[0], null);
        }
        LabelledSet known = in.labelled();
        int classes = known.classes().size();
        float[] probe = Arrays.copyOf(cand.x(), Math.min(PROBE_ROWS, cand.count()) * cand.cols());
        // The chains take as many threads as scoring does: one budget of cores for the whole round.
        RoundDraws draws = new PosteriorSampler(in.sampler(), scorer.threads()).sample(known.x(), known.labels(), classes, in.chains(),
                probe, in.seeds().child(CHAINS), stop);
        PoolScorer.Result scores = scorer.score(draws.layout(), draws.draws(), cand.x(), cand.count());
        Picks picks = BatchPicker.pick(settings.strategy(), b, scores, cand.x(), known, draws.layout(), draws.draws(),
                pickRng);
        List<SpotChecks.Entry> mixed = SpotChecks.mix(picks, cand.count(), b, settings.spotCheckShare(), spotRng);
        int[] at = mixed.stream().mapToInt(SpotChecks.Entry::candidate).toArray();
        Predictive.Belief belief = Predictive.belief(draws.layout(), draws.draws(), RowMajor.gather(cand.x(), cand.cols(), at),
                at.length);
        List<Pick> queue = new ArrayList<>();
        for (int i = 0; i < mixed.size(); i++) {
            SpotChecks.Entry e = mixed.get(i);
            queue.add(new Pick(cand.rows()[e.candidate()], e.candidate(), scores.bald()[e.candidate()], e.spotCheck(),
                    e.probability(), e.order(), 1, Arrays.copyOfRange(belief.mean(), i * classes, (i + 1) * classes),
                    Arrays.copyOfRange(belief.sd(), i * classes, (i + 1) * classes)));
        }
        float[] judgedMean = Predictive.meanProbabilities(draws.layout(), draws.draws(), in.judged().x(),
                in.judged().count());
        double[] rankBy = NextBest.scoreOf(settings.strategy(), scores);
        int[] next = NextBest.ranked(rankBy, cand.count(), at, NextBest.size(b, cand.count() - at.length),
                in.seeds().child(RESERVE).rng());
        Predictive.Belief nextBelief = Predictive.belief(draws.layout(), draws.draws(),
                RowMajor.gather(cand.x(), cand.cols(), next), next.length);
        List<Pick> reserve = new ArrayList<>(next.length);
        for (int i = 0; i < next.length; i++) {
            reserve.add(new Pick(cand.rows()[next[i]], next[i], scores.bald()[next[i]], false, Double.NaN, 0, 1,
                    Arrays.copyOfRange(nextBelief.mean(), i * classes, (i + 1) * classes),
                    Arrays.copyOfRange(nextBelief.sd(), i * classes, (i + 1) * classes)));
        }
        // The server's candidates are exactly the records nobody labelled; a benchmark's may be a sample of them.
        long[] labelled = LongStream.concat(Arrays.stream(known.poolRows()),
                Arrays.stream(in.judged().rows())).toArray();
        Settling settling = Settling.of(draws, in.stopSet(), labelled, cand.count(), scores.bald(), b, classes);
        return new Result(in.round(), withCopies(queue, settings.doubleLabelShare(), in), reserve, draws,
                draws.choice().kernel().word(), draws.choice().why(), judgedMean, settling);
    }

    /**
     * Marks {@code share} of the queue, chosen uniformly, to be labelled by two different people:
     * the pairs that agreement is measured on.
     */
    static List<Pick> withCopies(List<Pick> queue, double share, Input in) {
        boolean[] twice = chooseTwice(queue.size(), share, in.seeds().child(COPIES).rng());
        List<Pick> out = new ArrayList<>(queue.size());
        for (int i = 0; i < queue.size(); i++) {
            Pick p = queue.get(i);
            out.add(twice[i] ? new Pick(p.row(), p.candidate(), p.score(), p.spotCheck(), p.probability(), p.order(),
                    2, p.mean(), p.sd()) : p);
        }
        return out;
    }

    /** round(share * n) of n places, a uniform subset. */
    static boolean[] chooseTwice(int n, double share, SplittableRandom rng) {
        boolean[] chosen = new boolean[n];
        for (int i : Pickers.uniform(n, (int) Math.round(share * n), rng).positions()) {
            chosen[i] = true;
        }
        return chosen;
    }
}
