package dev.dowser.team;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.dowser.TestSupport;
import dev.dowser.labels.Resolution;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

class AgreementTest {

    /** Records labelled by two people, laid out as the 2 x 2 table [[20, 5], [10, 15]] (ana's class first). */
    private static List<Resolution> twoByTwo() {
        List<Resolution> out = new ArrayList<>();
        int[][] table = {{20, 5}, {10, 15}};
        String[] classes = {"ok", "fault"};
        long row = 0;
        for (int a = 0; a < 2; a++) {
            for (int b = 0; b < 2; b++) {
                for (int n = 0; n < table[a][b]; n++) {
                    out.add(new Resolution(row++, List.of(
                            new Resolution.Opinion("ana", classes[a], TestSupport.NOW, null),
                            new Resolution.Opinion("ben", classes[b], TestSupport.NOW, null)), null));
                }
            }
        }
        return out;
    }

    @Test
    void pairsTeamAndConfusionFromSharedRecords() {
        List<Resolution> shared = twoByTwo();
        // One record labelled by one person only: no agreement to measure there.
        shared.add(new Resolution(99, List.of(new Resolution.Opinion("cy", "ok", TestSupport.NOW, null)), null));
        Agreement a = Agreement.of(shared, List.of("ok", "fault"));
        assertEquals(50, a.records());
        assertEquals(1, a.pairs().size());
        assertEquals("ana", a.pairs().get(0).first());
        assertEquals(50, a.pairs().get(0).records());
        // The 2 x 2 example: p_o = 0.7, p_e = 0.5, Cohen's kappa 0.40 (worked by hand from Cohen 1960).
        assertEquals(0.40, a.pairs().get(0).kappa(), 1e-12);
        // With two labels per record Fleiss' kappa is Scott's pi (Fleiss 1971): pooled shares 0.55 and
        // 0.45 give p_e = 0.505, so pi = (0.7 - 0.505) / 0.495 = 0.393939... (hand computation).
        assertEquals(0.195 / 0.495, a.fleiss(), 1e-12);
        // Disagreements read the same from either side; agreements sit on the diagonal once each.
        assertArrayEquals(new long[] {20, 15}, a.confusion()[0]);
        assertArrayEquals(new long[] {15, 15}, a.confusion()[1]);
    }

    @Test
    void namesAreOrderedSoEachPairIsCountedOnce() {
        List<Resolution> shared = List.of(
                new Resolution(0, List.of(new Resolution.Opinion("zed", "ok", TestSupport.NOW, null),
                        new Resolution.Opinion("amy", "ok", TestSupport.NOW, null)), null),
                new Resolution(1, List.of(new Resolution.Opinion("amy", "fault", TestSupport.NOW, null),
                        new Resolution.Opinion("zed", "ok", TestSupport.NOW, null)), null));
        Agreement a = Agreement.of(shared, List.of("ok", "fault"));
        assertEquals(1, a.pairs().size());
        assertEquals(2, a.pairs().get(0).records());
        assertEquals("amy", a.pairs().get(0).first());
    }
}
