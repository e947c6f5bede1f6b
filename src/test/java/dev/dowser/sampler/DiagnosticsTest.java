package dev.dowser.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * R-hat and ESS on chains whose answers are known: AR(1) processes, whose effective sample size
 * is N (1 - rho) / (1 + rho) (Geyer 1992, "Practical Markov Chain Monte Carlo", the AR(1) example:
 * the asymptotic variance of the mean is sigma^2 (1 + rho) / (1 - rho)), and i.i.d. or shifted chains.
 */
class DiagnosticsTest {

    static double[] ar1(SplittableRandom rng, int n, double rho) {
        double[] x = new double[n];
        double sd = Math.sqrt(1 - rho * rho);
        x[0] = rng.nextGaussian();
        for (int i = 1; i < n; i++) {
            x[i] = rho * x[i - 1] + sd * rng.nextGaussian();
        }
        return x;
    }

    /** Mean ESS over many independent single chains of length N, against N(1 - rho)/(1 + rho). */
    private static double meanEss(double rho, int n, int replications, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        double sum = 0;
        for (int r = 0; r < replications; r++) {
            sum += Diagnostics.ess(new double[][] {ar1(rng, n, rho)});
        }
        return sum / replications;
    }

    @Test
    void essOfAr1Chains() {
        assertEquals(1000 * 0.5 / 1.5, meanEss(0.5, 1000, 200, 1), 0.15 * 333.3);
        assertEquals(1000 * 0.1 / 1.9, meanEss(0.9, 1000, 200, 2), 0.15 * 52.6);
    }

    @Test
    void bulkEssOfFourAr1ChainsIsNearTheTheory() {
        SplittableRandom rng = new SplittableRandom(3);
        double sum = 0;
        int reps = 50;
        for (int r = 0; r < reps; r++) {
            double[][] chains = new double[4][];
            for (int c = 0; c < 4; c++) {
                chains[c] = ar1(rng, 1000, 0.5);
            }
            sum += Diagnostics.essBulk(chains);
        }
        // Four chains of 1000: 4 * 333.3 draws' worth.
        assertEquals(4 * 333.3, sum / reps, 0.15 * 4 * 333.3);
    }

    @Test
    void independentChainsHaveRhatNearOne() {
        SplittableRandom rng = new SplittableRandom(4);
        double[][] chains = new double[4][1000];
        for (double[] c : chains) {
            for (int i = 0; i < c.length; i++) {
                c[i] = rng.nextGaussian();
            }
        }
        double rhat = Diagnostics.rhat(chains);
        assertTrue(rhat < 1.01, "R-hat " + rhat);
        double tail = Diagnostics.essTail(chains);
        assertTrue(tail > 2_000, "tail ESS " + tail);
    }

    @Test
    void chainsWithShiftedMeansHaveLargeRhat() {
        SplittableRandom rng = new SplittableRandom(5);
        double[][] chains = new double[4][1000];
        for (int c = 0; c < 4; c++) {
            for (int i = 0; i < 1000; i++) {
                chains[c][i] = rng.nextGaussian() + 0.5 * c;
            }
        }
        double rhat = Diagnostics.rhat(chains);
        assertTrue(rhat > 1.1, "R-hat " + rhat);
    }

    @Test
    void chainsWithDifferentSpreadAreCaughtByFolding() {
        SplittableRandom rng = new SplittableRandom(6);
        double[][] chains = new double[4][1000];
        for (int c = 0; c < 4; c++) {
            for (int i = 0; i < 1000; i++) {
                chains[c][i] = rng.nextGaussian() * (c == 3 ? 3.0 : 1.0);
            }
        }
        // Same means, so the bulk R-hat misses it; the folded one does not.
        assertTrue(Diagnostics.plainRhat(Diagnostics.rankNormalize(Diagnostics.split(chains))) < 1.02);
        assertTrue(Diagnostics.rhat(chains) > 1.05, "R-hat " + Diagnostics.rhat(chains));
    }

    @Test
    void withinChainFiguresIgnoreChainsSittingApartButCatchDrift() {
        // Four i.i.d. chains centred 3 SD apart (separate modes): R-hat across them is large, yet
        // within each chain the halves agree (R-hat below Vehtari et al.'s 1.01) and the within ESS
        // is near the 4,000 independent draws (tolerance 15%, as for the AR(1) checks above).
        SplittableRandom rng = new SplittableRandom(7);
        double[][] apart = new double[4][1000];
        double[][] drifting = new double[4][1000];
        for (int c = 0; c < 4; c++) {
            for (int i = 0; i < 1000; i++) {
                apart[c][i] = rng.nextGaussian() + 3.0 * c;
                // A chain still moving: its mean climbs 2 SD from its first draw to its last.
                drifting[c][i] = rng.nextGaussian() + 2.0 * i / 1000;
            }
        }
        assertTrue(Diagnostics.rhat(apart) > 2, "R-hat " + Diagnostics.rhat(apart));
        assertTrue(Diagnostics.rhatWithin(apart) < 1.01, "R-hat within " + Diagnostics.rhatWithin(apart));
        assertEquals(4000, Diagnostics.essWithin(apart), 0.15 * 4000);
        assertTrue(Diagnostics.rhatWithin(drifting) > 1.1, "R-hat within " + Diagnostics.rhatWithin(drifting));
        assertTrue(Diagnostics.essWithin(drifting) < 400, "ESS within " + Diagnostics.essWithin(drifting));
    }
}
