package dev.dowser.advice;

import dev.dowser.words.Worded;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * The chains' health in plain words, judged against thresholds that fit the draws actually kept,
 * and advice that names the pool setting that would help. A point that no setting can help is
 * never raised.
 *
 * <p>Thresholds. Vehtari et al. (2021) ask for an effective sample size (ESS) of 100 per chain,
 * which with Stan's default of 1,000 draws per chain is a tenth of the draws; we keep that share,
 * ESS >= 0.1 S for S draws, rather than the absolute 400 that 64 draws can never reach. Vats &
 * Knudson (2021, "Revisiting the Gelman-Rubin diagnostic") tie R-hat to ESS for m chains,
 * R-hat ~ sqrt(1 + m / ESS) (from memory), so the R-hat that goes with that ESS is
 * sqrt(1 + m / (0.1 S)): 1.27 for 4 chains and 64 draws, 1.005 for Stan's 4 x 1,000 (near their
 * usual 1.01). R-hat is computed in function space (the log-likelihood and predictions of the
 * draws), since a network's weights are only identified up to relabelled hidden units.
 *
 * @param level    good, note (worth knowing, nothing wrong) or act (a setting would help)
 * @param summary  one sentence for the overview
 * @param points   the points in plain words, each with the setting it names
 * @param rhatCeiling the R-hat above which the chains count as disagreeing, for the draws kept
 * @param essFloor    the effective sample size below which the draws count as too few, for the draws kept
 */
public record ChainAdvice(Level level, String summary, List<Point> points, double rhatCeiling, double essFloor) {

    /** How much the chains' health asks of the admin, by its word in the API. */
    public enum Level implements Worded {
        /** Nothing to do. */
        GOOD,
        /** Worth knowing; nothing is wrong. */
        NOTE,
        /** A setting would help. */
        ACT
    }

    /** The share of the draws that should count as independent (see the class comment). */
    public static final double ESS_SHARE = 0.1;

    /** The sentence every disagreement comes with. */
    static final String EXPLANATIONS = "Chains that disagree can each be a different good explanation of the"
            + " labels; the queue and the accuracy average over all of them.";

    /**
     * The sentence for chains that each settled in a different mode: no setting makes them agree,
     * and none needs to.
     */
    public static final String MODES = "Different modes are different good explanations of the labels; the queue and"
            + " the accuracy average over all of them, which is why chains start apart.";

    /**
     * One point of advice.
     *
     * @param text    the point in plain words
     * @param setting the pool setting that would help ({@code draws}, {@code chains}, {@code reburn_in_steps}), or null
     * @param suggest the value to try, or 0 with no setting
     */
    public record Point(String text, String setting, int suggest) {
    }

    /**
     * The sampler's settings now and how far each may go, for suggesting values.
     *
     * @param chains        chains run side by side
     * @param draws         draws kept in all
     * @param reburnInSteps steps each continued chain takes before drawing
     * @param maxChains     the most chains allowed
     * @param maxDraws      the most draws allowed
     * @param maxReburnIn   the longest re-burn-in allowed
     */
    public record Knobs(int chains, int draws, int reburnInSteps, int maxChains, int maxDraws, int maxReburnIn) {
    }

    public ChainAdvice {
        points = List.copyOf(points);
    }

    /** ESS below this, for S draws kept, means the draws lean on few independent ones. */
    public static double essFloor(int draws) {
        return ESS_SHARE * draws;
    }

    /** R-hat above this, for m chains and S draws, means the chains disagree beyond the draws' own noise. */
    public static double rhatCeiling(int chains, int draws) {
        // R-hat ~ sqrt(1 + m / ESS) at ESS = 0.1 S (Vats & Knudson 2021).
        return Math.sqrt(1 + chains / essFloor(draws));
    }

    /**
     * Advice from a round's health: the largest function-space R-hat and the smallest bulk and
     * tail ESS (NaN when too few draws to judge), for the {@code chains} and {@code draws} that
     * round kept; suggestions start from the settings as they are now ({@code knobs}). Without the
     * within-chain figures the ESS across chains stands for both.
     */
    public static ChainAdvice of(double rhat, double essBulk, double essTail, int chains, int draws, Knobs knobs) {
        return of(rhat, essBulk, essTail, Double.NaN, Double.NaN, chains, draws, knobs);
    }

    /**
     * As above, with the figures within the chains ({@code rhatWithin}, {@code essWithin}: each
     * chain judged about its own centre; NaN when not known). They tell apart two things the
     * across-chain R-hat mixes: chains that still drift (a longer warm-up helps: act) and chains
     * that each settled in a different mode (the predictive averages the modes on purpose, as
     * multi-start sampling does: Wilson & Izmailov 2020, Sommer et al. 2024; a note). The ESS
     * that asks for more draws is the within-chain one, since draws in separate modes are few
     * across chains by construction, however well each chain mixes.
     */
    public static ChainAdvice of(double rhat, double essBulk, double essTail, double rhatWithin, double essWithin,
                                 int chains, int draws, Knobs knobs) {
        int m = chains;
        int s = draws;
        if (!Double.isFinite(rhat) || !Double.isFinite(essBulk)) {
            return new ChainAdvice(Level.GOOD, "Too few draws per chain to judge the chains; nothing to do.", List.of(),
                    rhatCeiling(m, s), essFloor(s));
        }
        boolean split = Double.isFinite(rhatWithin) && Double.isFinite(essWithin);
        double across = Double.isFinite(essTail) ? Math.min(essBulk, essTail) : essBulk;
        double ess = split ? essWithin : across;
        List<Point> points = new ArrayList<>();
        boolean disagree = rhat > rhatCeiling(m, s);
        boolean drift = split && rhatWithin > rhatCeiling(m, s);
        boolean correlated = ess < essFloor(s);
        String summary = null;
        Level level = Level.NOTE;
        if (drift) {
            String text = String.format(Locale.ROOT, "Some chains were still moving while they drew (R-hat within"
                    + " the chains %.2f, above %.2f): their first and second halves disagree.", rhatWithin,
                    rhatCeiling(m, s));
            if (knobs.reburnInSteps() < knobs.maxReburnIn()) {
                int more = Math.min(knobs.maxReburnIn(), Math.max(100, 2 * knobs.reburnInSteps()));
                points.add(new Point(text + " A longer warm-up each round (" + more + " steps) lets each chain"
                        + " settle before it draws.", "reburn_in_steps", more));
                level = Level.ACT;
                summary = "Some chains had not settled before drawing; a setting below would help.";
            } else {
                points.add(new Point(text + " The warm-up is at its longest already.", null, 0));
                summary = "Some chains had not settled before drawing; nothing more can be set to help.";
            }
        }
        if (correlated) {
            String worth = String.format(Locale.ROOT, "The %d draws behave like about %d independent ones.", s,
                    Math.max(1, Math.round(ess)));
            if (knobs.draws() > draws || knobs.chains() > chains) {
                points.add(new Point(worth + " More draws or chains have been set since; the next round uses them.",
                        null, 0));
                summary = summary != null ? summary
                        : "Predictions rested on few independent draws; the settings have been raised since.";
            } else if (knobs.draws() < knobs.maxDraws()) {
                int more = Math.min(knobs.maxDraws(), 2 * knobs.draws());
                points.add(new Point(worth + " Keeping more draws each round (" + more + ") makes predictions"
                        + " and scores steadier, at the cost of a longer round.", "draws", more));
                level = Level.ACT;
            } else if (knobs.chains() < knobs.maxChains()) {
                int more = Math.min(knobs.maxChains(), 2 * knobs.chains());
                points.add(new Point(worth + " More chains (" + more + ") add independent draws.", "chains", more));
                level = Level.ACT;
            } else {
                points.add(new Point(worth + " Draws and chains are at their largest already.", null, 0));
                summary = summary != null ? summary
                        : "The draws lean on few independent ones; nothing more can be set to help.";
            }
            if (level == Level.ACT && summary == null) {
                summary = "Predictions rest on few independent draws; a setting below would help.";
            }
        }
        if (disagree) {
            String text = split && !drift
                    ? String.format(Locale.ROOT, "Each chain settled (R-hat within the chains %.2f) but in a"
                    + " different mode from the others (R-hat across them %.2f).", rhatWithin, rhat) + " " + MODES
                    : "The chains do not settle on the same answers for every record. " + EXPLANATIONS;
            if (knobs.chains() < knobs.maxChains()) {
                int more = Math.min(knobs.maxChains(), 2 * knobs.chains());
                points.add(new Point(text + " More chains (" + more + ") take in more of them.", "chains", more));
            } else if (!split && knobs.reburnInSteps() < knobs.maxReburnIn()) {
                int more = Math.min(knobs.maxReburnIn(), Math.max(100, 2 * knobs.reburnInSteps()));
                points.add(new Point(text + " A longer warm-up each round (" + more + " steps) lets each chain"
                        + " settle further.", "reburn_in_steps", more));
            } else {
                points.add(new Point(text, null, 0));
            }
            if (summary == null) {
                summary = split && !drift
                        ? "Each chain settled in its own mode and predictions average them; nothing needs doing."
                        : "The chains tell somewhat different stories, which is usual for a neural network;"
                        + " nothing needs doing.";
            }
        }
        if (points.isEmpty()) {
            return new ChainAdvice(Level.GOOD, "The chains agree and their draws are varied enough; nothing to do.",
                    List.of(), rhatCeiling(m, s), essFloor(s));
        }
        // A note says what is so; only a point a setting can help is a call to act.
        return new ChainAdvice(level, summary, points, rhatCeiling(m, s), essFloor(s));
    }
}
