package dev.dowser.acquire;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** BALD and friends on closed forms: values worked by hand from the definitions (Houlsby et al. 2011). */
class ScoresTest {

    @Test
    void baldOfTwoCertainButOpposedDrawsIsLn2() {
        assertEquals(Math.log(2), Scores.bald(new float[] {1, 0, 0, 1}, 2, 2), 1e-12);
    }

    @Test
    void baldOfIdenticalDrawsIsZero() {
        assertEquals(0, Scores.bald(new float[] {0.3f, 0.7f, 0.3f, 0.7f, 0.3f, 0.7f}, 3, 2), 1e-12);
    }

    @Test
    void binaryExampleOfTheIssue() {
        // Two draws with p(y=1) = 0.1 and 0.9: H[0.5] - H[0.1] = ln 2 - 0.325083 = 0.368064 nats.
        assertEquals(0.368064, Scores.bald(new float[] {0.9f, 0.1f, 0.1f, 0.9f}, 2, 2), 1e-6);
    }

    @Test
    void boundsHoldOnRandomDraws() {
        SplittableRandom rng = new SplittableRandom(3);
        for (int t = 0; t < 1_000; t++) {
            int c = 2 + rng.nextInt(9);
            int s = 1 + rng.nextInt(20);
            float[] p = new float[s * c];
            for (int i = 0; i < s; i++) {
                double sum = 0;
                for (int k = 0; k < c; k++) {
                    p[i * c + k] = (float) Math.pow(rng.nextDouble(), 3);
                    sum += p[i * c + k];
                }
                for (int k = 0; k < c; k++) {
                    p[i * c + k] /= sum;
                }
            }
            double bald = Scores.bald(p, s, c);
            double h = Scores.predictiveEntropy(p, s, c);
            assertTrue(bald >= 0 && bald <= h + 1e-9 && h <= Math.log(c) + 1e-9, bald + " " + h);
        }
    }

    @Test
    void margin() {
        float[] p = {0.6f, 0.4f, 0.8f, 0.2f, 0.3f, 0.7f};
        // Mean probabilities 0.5667 and 0.4333: margin score 1 - 0.1333.
        assertEquals(1 - (1.7 - 1.3) / 3, Scores.margin(p, 3, 2), 1e-6);
    }
}
