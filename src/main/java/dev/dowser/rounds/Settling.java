package dev.dowser.rounds;

import dev.dowser.acquire.Pickers;
import dev.dowser.sampler.Predictive;
import dev.dowser.sampler.RoundDraws;
import dev.dowser.stats.Metrics;
import dev.dowser.stats.StabilisingPredictions;
import java.util.Arrays;

/**
 * What a round tells about whether more labels still pay: the serving model's predicted class
 * for each record of the pool's stop set, their agreement with the round before's (Bloodgood &
 * Vijay-Shanker 2009), and the information left in the pool, as BALD summed over every candidate
 * and over the batch's worth of best ones.
 *
 * @param stopRows       the stop set's rows, ascending
 * @param stopClasses    the class predicted for each (the posterior predictive's most likely)
 * @param agreement      Cohen's kappa between these predictions and the round before's, over the
 *                       stop-set records still unlabelled; NaN with nothing to compare
 * @param compared       the stop-set records the agreement was measured on
 * @param candidates     the unlabelled records the round picked from
 * @param information    BALD summed over every candidate (nats)
 * @param informationTop BALD summed over the b highest-scoring candidates (nats), b the batch size
 */
public record Settling(long[] stopRows, int[] stopClasses, double agreement, int compared, long candidates,
                       double information, double informationTop) {

    /**
     * The pool's stop set as a round sees it.
     *
     * @param rows     the stop set's records (their features and rows, ascending)
     * @param previous the class the round before predicted for each, or -1 where it predicted none
     */
    public record StopSet(RoundStep.Rows rows, int[] previous) {

        public StopSet {
            if (previous.length != rows.count()) {
                throw new IllegalArgumentException(previous.length + " earlier predictions for a stop set of "
                        + rows.count());
            }
        }

        /** A stop set with nothing predicted for it yet. */
        public static StopSet fresh(RoundStep.Rows rows) {
            int[] none = new int[rows.count()];
            Arrays.fill(none, -1);
            return new StopSet(rows, none);
        }

        /** The same records with the classes {@code s} predicted, for the next round. */
        public StopSet after(Settling s) {
            return new StopSet(rows, s.stopClasses());
        }
    }

    /**
     * The stop set's predictions and their agreement with the round before's, and the pool's information.
     *
     * @param labelled the records anyone has labelled (final or awaiting review), in any order: the
     *                 stop-set records among them are not compared. The candidates do not decide it,
     *                 because a benchmark may score only a sample of the unlabelled records, while
     *                 the agreement stays measured on the whole stop set as the server measures it.
     */
    static Settling of(RoundDraws draws, StopSet stop, long[] labelled, int candidates, double[] bald, int b,
                       int classes) {
        RoundStep.Rows rows = stop.rows();
        float[] p = Predictive.meanProbabilities(draws.layout(), draws.draws(), rows.x(), rows.count());
        long[] taken = labelled.clone();
        Arrays.sort(taken);
        int[] now = new int[rows.count()];
        int compared = 0;
        int[] before = new int[rows.count()];
        int[] after = new int[rows.count()];
        for (int i = 0; i < now.length; i++) {
            now[i] = Metrics.argmax(p, i, classes);
            // Only records still unlabelled count: a labelled record's prediction is pinned by its label.
            if (stop.previous()[i] >= 0 && Arrays.binarySearch(taken, rows.rows()[i]) < 0) {
                before[compared] = stop.previous()[i];
                after[compared] = now[i];
                compared++;
            }
        }
        double kappa = compared == 0 ? Double.NaN : StabilisingPredictions.agreement(
                Arrays.copyOf(before, compared), Arrays.copyOf(after, compared), classes);
        double sum = 0;
        for (double v : bald) {
            sum += v;
        }
        double top = 0;
        for (int i : Pickers.topB(bald, Math.min(b, bald.length))) {
            top += bald[i];
        }
        return new Settling(rows.rows(), now, kappa, compared, candidates, sum, top);
    }
}
