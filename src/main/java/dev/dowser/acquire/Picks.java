package dev.dowser.acquire;

/**
 * A batch picked from candidates, in the order picked, each with the probability with which it
 * was picked given the picks before it: for a stochastic picker the proposal q(i_m) that
 * importance-weighted estimators need (Farquhar, Gal & Rainforth 2021), 1 for a greedy one.
 *
 * @param positions     the candidates' positions, first pick first
 * @param probabilities the conditional probability of each pick
 */
public record Picks(int[] positions, double[] probabilities) {

    public Picks {
        if (positions.length != probabilities.length) {
            throw new IllegalArgumentException(positions.length + " picks with " + probabilities.length
                    + " probabilities");
        }
    }

    /** Picks made greedily: each had probability 1. */
    public static Picks greedy(int[] positions) {
        double[] ones = new double[positions.length];
        java.util.Arrays.fill(ones, 1.0);
        return new Picks(positions, ones);
    }

    public int size() {
        return positions.length;
    }
}
