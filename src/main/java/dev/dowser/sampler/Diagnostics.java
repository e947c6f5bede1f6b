package dev.dowser.sampler;

import dev.dowser.stats.Normal;
import java.util.Arrays;

/**
 * Convergence diagnostics of Vehtari, Gelman, Simpson, Carpenter & Buerkner (2021),
 * "Rank-normalization, folding, and localization: an improved R-hat for assessing convergence of
 * MCMC", for draws of one scalar summary from several chains ({@code chains[m][n]}).
 */
public final class Diagnostics {

    private Diagnostics() {
    }

    /** Rank-normalised split R-hat: the larger of the bulk value and the folded (tail) value. */
    public static double rhat(double[][] chains) {
        double[][] split = split(chains);
        double bulk = plainRhat(rankNormalize(split));
        double tail = plainRhat(rankNormalize(fold(split)));
        return Math.max(bulk, tail);
    }

    /** Bulk effective sample size: the ESS of the rank-normalised split chains. */
    public static double essBulk(double[][] chains) {
        return ess(rankNormalize(split(chains)));
    }

    /** Tail effective sample size: the smaller ESS of the indicators of the 5% and 95% quantiles. */
    public static double essTail(double[][] chains) {
        double[][] split = split(chains);
        double[] all = flatten(split);
        Arrays.sort(all);
        double q05 = quantile(all, 0.05);
        double q95 = quantile(all, 0.95);
        return Math.min(ess(indicator(split, q05)), ess(indicator(split, q95)));
    }

    /**
     * R-hat within the chains: the same rank-normalised split R-hat (bulk and folded), with each
     * chain ranked among its own draws, so that chains sitting apart (in different modes) no
     * longer count and only drift inside a chain, one half against the other, does. The between
     * and within parts of var+ are Gelman & Rubin's (1992); judging them apart for chains started
     * at separate modes is our use, not a published diagnostic.
     */
    public static double rhatWithin(double[][] chains) {
        double[][] split = split(rankNormalizeEach(chains));
        double bulk = plainRhat(split);
        double tail = plainRhat(split(rankNormalizeEach(foldEach(chains))));
        return Math.max(bulk, tail);
    }

    /**
     * Bulk ESS within the chains: the ESS of the split chains, each ranked among its own draws, so
     * the draws are judged about their own chain's centre. For chains in different modes this is
     * how many independent draws each mode's share of the predictive rests on, in all.
     */
    public static double essWithin(double[][] chains) {
        return ess(split(rankNormalizeEach(chains)));
    }

    /** Each chain rank-normalised on its own ({@link #rankNormalize} with one chain at a time). */
    static double[][] rankNormalizeEach(double[][] chains) {
        double[][] out = new double[chains.length][];
        for (int j = 0; j < chains.length; j++) {
            out[j] = rankNormalize(new double[][] {chains[j]})[0];
        }
        return out;
    }

    /** Each chain folded about its own median. */
    private static double[][] foldEach(double[][] chains) {
        double[][] out = new double[chains.length][];
        for (int j = 0; j < chains.length; j++) {
            out[j] = fold(new double[][] {chains[j]})[0];
        }
        return out;
    }

    /** R-hat of Gelman et al. (BDA3, eq. 11.4) on the chains as given: sqrt(var+ / W). */
    static double plainRhat(double[][] chains) {
        int m = chains.length;
        int n = chains[0].length;
        double[] means = new double[m];
        double w = 0;
        for (int j = 0; j < m; j++) {
            means[j] = mean(chains[j]);
            w += variance(chains[j], means[j]);
        }
        w /= m;
        double b = n * variance(means, mean(means));
        double varPlus = (n - 1.0) / n * w + b / n;
        return Math.sqrt(varPlus / w);
    }

    /**
     * Effective sample size of the chains as given, from their combined autocorrelation with
     * Geyer's initial monotone sequence (BDA3, section 11.5; as in Stan):
     * rho_t = 1 - (W - mean_m acov_m(t)) / var+; sums of pairs rho_2k + rho_2k+1 are kept while
     * positive and made non-increasing; tau = -1 + 2 sum of the pairs; ESS = M N / tau.
     */
    static double ess(double[][] chains) {
        int m = chains.length;
        int n = chains[0].length;
        if (n < 4) {
            return Double.NaN;
        }
        double[][] acov = new double[m][];
        double[] means = new double[m];
        double w = 0;
        for (int j = 0; j < m; j++) {
            means[j] = mean(chains[j]);
            acov[j] = autocovariance(chains[j], means[j]);
            w += acov[j][0] * n / (n - 1.0);
        }
        w /= m;
        double varPlus = w * (n - 1.0) / n + (m > 1 ? variance(means, mean(means)) : 0);
        if (!(varPlus > 0)) {
            return Double.NaN;
        }
        double[] rho = new double[n];
        for (int t = 0; t < n; t++) {
            double meanAcov = 0;
            for (int j = 0; j < m; j++) {
                meanAcov += acov[j][t];
            }
            meanAcov /= m;
            rho[t] = 1 - (w - meanAcov) / varPlus;
        }
        rho[0] = 1;
        double sum = 0;
        double previous = Double.POSITIVE_INFINITY;
        for (int k = 0; 2 * k + 1 < n; k++) {
            double pair = rho[2 * k] + rho[2 * k + 1];
            if (pair < 0) {
                break;
            }
            pair = Math.min(pair, previous);
            previous = pair;
            sum += pair;
        }
        double tau = -1 + 2 * sum;
        // Antithetic chains can make tau tiny; the paper caps ESS at N log10(N) per chain.
        tau = Math.max(tau, 1 / Math.log10(m * (double) n));
        return m * n / tau;
    }

    /** Autocovariance at every lag, biased (divided by n), as the ESS estimate uses. */
    static double[] autocovariance(double[] x, double mean) {
        int n = x.length;
        double[] out = new double[n];
        for (int t = 0; t < n; t++) {
            double s = 0;
            for (int i = 0; i + t < n; i++) {
                s += (x[i] - mean) * (x[i + t] - mean);
            }
            out[t] = s / n;
        }
        return out;
    }

    /** Each chain cut in two halves (the middle draw of an odd length is dropped). */
    static double[][] split(double[][] chains) {
        int n = chains[0].length / 2;
        double[][] out = new double[2 * chains.length][];
        for (int j = 0; j < chains.length; j++) {
            if (chains[j].length != chains[0].length) {
                throw new IllegalArgumentException("chains differ in length");
            }
            out[2 * j] = Arrays.copyOfRange(chains[j], 0, n);
            out[2 * j + 1] = Arrays.copyOfRange(chains[j], chains[j].length - n, chains[j].length);
        }
        return out;
    }

    /**
     * Rank normalisation: each draw's rank r among all S draws (ties averaged) mapped to
     * Phi^-1((r - 3/8) / (S + 1/4)) (Blom 1958), as the paper prescribes.
     */
    static double[][] rankNormalize(double[][] chains) {
        int m = chains.length;
        int n = chains[0].length;
        int total = m * n;
        Integer[] order = new Integer[total];
        double[] all = flatten(chains);
        for (int i = 0; i < total; i++) {
            order[i] = i;
        }
        Arrays.sort(order, (a, b) -> Double.compare(all[a], all[b]));
        double[] rank = new double[total];
        for (int i = 0; i < total; ) {
            int j = i;
            while (j + 1 < total && all[order[j + 1]] == all[order[i]]) {
                j++;
            }
            double r = (i + j) / 2.0 + 1;
            for (int k = i; k <= j; k++) {
                rank[order[k]] = r;
            }
            i = j + 1;
        }
        double[][] out = new double[m][n];
        for (int i = 0; i < total; i++) {
            out[i / n][i % n] = Normal.quantile((rank[i] - 0.375) / (total + 0.25));
        }
        return out;
    }

    /** |x - median|: spread in the tails shows up as a difference in location. */
    static double[][] fold(double[][] chains) {
        double[] all = flatten(chains);
        Arrays.sort(all);
        double median = quantile(all, 0.5);
        double[][] out = new double[chains.length][];
        for (int j = 0; j < chains.length; j++) {
            out[j] = new double[chains[j].length];
            for (int i = 0; i < chains[j].length; i++) {
                out[j][i] = Math.abs(chains[j][i] - median);
            }
        }
        return out;
    }

    private static double[][] indicator(double[][] chains, double threshold) {
        double[][] out = new double[chains.length][];
        for (int j = 0; j < chains.length; j++) {
            out[j] = new double[chains[j].length];
            for (int i = 0; i < chains[j].length; i++) {
                out[j][i] = chains[j][i] <= threshold ? 1 : 0;
            }
        }
        return out;
    }

    private static double[] flatten(double[][] chains) {
        int n = chains[0].length;
        double[] all = new double[chains.length * n];
        for (int j = 0; j < chains.length; j++) {
            System.arraycopy(chains[j], 0, all, j * n, n);
        }
        return all;
    }

    /** Linear interpolation between order statistics of sorted data (type 7). */
    static double quantile(double[] sorted, double p) {
        double h = (sorted.length - 1) * p;
        int lo = (int) Math.floor(h);
        int hi = Math.min(sorted.length - 1, lo + 1);
        return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
    }

    private static double mean(double[] x) {
        double s = 0;
        for (double v : x) {
            s += v;
        }
        return s / x.length;
    }

    /** Sample variance, divided by n - 1. */
    private static double variance(double[] x, double mean) {
        double s = 0;
        for (double v : x) {
            s += (v - mean) * (v - mean);
        }
        return s / (x.length - 1);
    }
}
