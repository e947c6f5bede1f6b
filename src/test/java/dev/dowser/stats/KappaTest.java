package dev.dowser.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.dkpro.statistics.agreement.coding.CodingAnnotationStudy;
import org.dkpro.statistics.agreement.coding.CohenKappaAgreement;
import org.dkpro.statistics.agreement.coding.FleissKappaAgreement;
import org.junit.jupiter.api.Test;

class KappaTest {

    @Test
    void fleissMatchesFleiss1971TableOne() {
        // Fleiss (1971), Table 1: 30 patients, 6 psychiatrists, 5 diagnoses (also R's irr `diagnoses`
        // set); the paper gives kappa = 0.430.
        String table = "00060 03003 01401 00006 03030 20400 00402 20310 20040 00006 10050 11040 03300 "
                + "10050 02031 00501 30012 51000 02040 10203 00006 01050 02013 20040 10041 05010 40002 "
                + "02040 10500 00006";
        String[] patients = table.split(" ");
        int[][] counts = new int[patients.length][5];
        for (int i = 0; i < patients.length; i++) {
            for (int j = 0; j < 5; j++) {
                counts[i][j] = patients[i].charAt(j) - '0';
            }
            assertEquals(6, Arrays.stream(counts[i]).sum(), "patient " + (i + 1));
        }
        assertEquals(0.430, Kappa.fleiss(counts), 5e-4);
    }

    @Test
    void cohenMatchesPublishedTables() {
        // SAS PROC FREQ documentation, the worked example of agreement statistics: kappa 0.4842.
        assertEquals(0.4842, Kappa.cohen(new long[][] {{0, 4, 1}, {0, 8, 0}, {0, 1, 5}}), 5e-5);
        // A two-by-two table worked by hand: p_o = 35/50 = 0.7, p_e = 0.5, kappa = 0.4.
        assertEquals(0.40, Kappa.cohen(new long[][] {{20, 5}, {10, 15}}), 1e-12);
    }

    @Test
    void agreesWithDkproStatisticsOnRandomRatings() {
        // DKPro Statistics (Meyer et al. 2014), an independent implementation from Maven Central.
        SplittableRandom rng = new SplittableRandom(11);
        for (int trial = 0; trial < 50; trial++) {
            int classes = rng.nextInt(2, 6);
            int items = rng.nextInt(10, 80);
            int raters = rng.nextInt(2, 6);
            CodingAnnotationStudy pairStudy = new CodingAnnotationStudy(2);
            CodingAnnotationStudy teamStudy = new CodingAnnotationStudy(raters);
            long[][] table = new long[classes][classes];
            int[][] counts = new int[items][classes];
            for (int i = 0; i < items; i++) {
                // Mostly agreeing ratings around a true class, so kappa spans a useful range.
                int truth = rng.nextInt(classes);
                Object[] ratings = new Object[raters];
                for (int r = 0; r < raters; r++) {
                    int c = rng.nextDouble() < 0.6 ? truth : rng.nextInt(classes);
                    ratings[r] = c;
                    counts[i][c]++;
                }
                table[(Integer) ratings[0]][(Integer) ratings[1]]++;
                pairStudy.addItem(ratings[0], ratings[1]);
                teamStudy.addItemAsArray(ratings);
            }
            double ours = Kappa.cohen(table);
            double theirs = new CohenKappaAgreement(pairStudy).calculateAgreement();
            assertEquals(theirs, ours, 1e-9, "Cohen, trial " + trial);
            assertEquals(new FleissKappaAgreement(teamStudy).calculateAgreement(), Kappa.fleiss(counts), 1e-9,
                    "Fleiss, trial " + trial);
        }
    }

    @Test
    void edgeCasesAreNaNOrNamedErrors() {
        assertTrue(Double.isNaN(Kappa.cohen(new long[][] {{0, 0}, {0, 0}})));
        assertTrue(Double.isNaN(Kappa.cohen(new long[][] {{7, 0}, {0, 0}})), "one class only: chance is total");
        assertTrue(Double.isNaN(Kappa.fleiss(new int[][] {{1, 0}, {0, 1}})), "no record has two labels");
        assertEquals("the table must be square: row 1 has 1 cells, not 2",
                assertThrows(IllegalArgumentException.class, () -> Kappa.cohen(new long[][] {{1, 2}, {3}}))
                        .getMessage());
    }
}
