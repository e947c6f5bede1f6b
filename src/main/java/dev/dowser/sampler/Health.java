package dev.dowser.sampler;

import dev.dowser.model.Layout;
import dev.dowser.model.Mlp;
import java.util.ArrayList;
import java.util.List;

/**
 * How usable the chains are, judged on function-space summaries (weights themselves are not
 * identifiable: hidden units can be permuted): the labelled-set log-likelihood of each draw, and
 * the predictive probability each draw gives a few probe rows. The numbers only: what they mean for
 * the draws kept, in plain words, is {@code dev.dowser.advice.ChainAdvice}'s to say.
 *
 * @param rhatMax        largest rank-normalised split R-hat over the summaries
 * @param essBulkMin     smallest bulk effective sample size
 * @param essTailMin     smallest tail effective sample size
 * @param acceptance     mean MH acceptance rate (MALA), NaN otherwise
 * @param meanStepSize   mean base step size over chains at the end
 * @param divergences    divergences recovered from
 * @param rhatWithinMax  largest R-hat within the chains (each chain ranked on its own: drift inside a chain, not
 *                       disagreement between chains; {@link Diagnostics#rhatWithin})
 * @param essWithinMin   smallest bulk ESS within the chains (draws judged about their own chain's centre;
 *                       {@link Diagnostics#essWithin})
 */
public record Health(double rhatMax, double essBulkMin, double essTailMin, double acceptance, double meanStepSize,
                     int divergences, double rhatWithinMax, double essWithinMin) {

    static Health of(List<ChainRun> runs, MlpPosterior target, Layout layout, float[] probe) {
        int chains = runs.size();
        int draws = runs.get(0).draws().size();
        int inputs = layout.architecture().inputs();
        int classes = layout.architecture().classes();
        int probeRows = probe == null ? 0 : probe.length / inputs;
        List<double[][]> summaries = new ArrayList<>();
        double[][] logLik = new double[chains][draws];
        double[][][] probeP = new double[probeRows][chains][draws];
        Mlp mlp = new Mlp(layout, Math.max(1, probeRows));
        float[] p = new float[Math.max(1, probeRows) * classes];
        for (int c = 0; c < chains; c++) {
            for (int d = 0; d < draws; d++) {
                float[] theta = runs.get(c).draws().get(d);
                logLik[c][d] = target.logLikelihood(theta);
                if (probeRows > 0) {
                    mlp.probabilities(theta, probe, 0, probeRows, p);
                    for (int r = 0; r < probeRows; r++) {
                        probeP[r][c][d] = p[r * classes];
                    }
                }
            }
        }
        summaries.add(logLik);
        for (double[][] s : probeP) {
            summaries.add(s);
        }
        double rhat = Double.NaN;
        double bulk = Double.NaN;
        double tail = Double.NaN;
        double rhatWithin = Double.NaN;
        double essWithin = Double.NaN;
        if (draws >= 4) {
            rhat = 0;
            bulk = Double.POSITIVE_INFINITY;
            tail = Double.POSITIVE_INFINITY;
            rhatWithin = 0;
            essWithin = Double.POSITIVE_INFINITY;
            for (double[][] s : summaries) {
                if (constant(s)) {
                    continue;
                }
                rhat = finiteMax(rhat, Diagnostics.rhat(s));
                bulk = finiteMin(bulk, Diagnostics.essBulk(s));
                tail = finiteMin(tail, Diagnostics.essTail(s));
                rhatWithin = finiteMax(rhatWithin, Diagnostics.rhatWithin(s));
                essWithin = finiteMin(essWithin, Diagnostics.essWithin(s));
            }
            // No summary could be judged (too few draws per half-chain): there is no figure, not an infinite one.
            bulk = Double.isInfinite(bulk) ? Double.NaN : bulk;
            tail = Double.isInfinite(tail) ? Double.NaN : tail;
            essWithin = Double.isInfinite(essWithin) ? Double.NaN : essWithin;
        }
        double acc = 0;
        double step = 0;
        int divergences = 0;
        int withMh = 0;
        for (ChainRun r : runs) {
            double rate = r.last().extra().acceptanceRate();
            if (!Double.isNaN(rate)) {
                acc += rate;
                withMh++;
            }
            step += r.last().stepSize();
            divergences += r.divergences().size();
        }
        double acceptance = withMh > 0 ? acc / withMh : Double.NaN;
        return new Health(rhat, bulk, tail, acceptance, step / chains, divergences, rhatWithin, essWithin);
    }

    /** A summary whose indicator never varies (every draw on one side of a quantile) says nothing: skip it. */
    private static double finiteMin(double a, double b) {
        return Double.isFinite(b) ? Math.min(a, b) : a;
    }

    private static double finiteMax(double a, double b) {
        return Double.isFinite(b) ? Math.max(a, b) : a;
    }

    private static boolean constant(double[][] s) {
        double first = s[0][0];
        for (double[] c : s) {
            for (double v : c) {
                if (v != first) {
                    return false;
                }
            }
        }
        return true;
    }
}
