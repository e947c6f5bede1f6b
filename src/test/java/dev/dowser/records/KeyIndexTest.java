package dev.dowser.records;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.HashMap;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** Ids to rows, checked against a plain map, including ids whose hashes collide. */
class KeyIndexTest {

    @Test
    void findsEveryIdAndNothingElse() {
        SplittableRandom rng = new SplittableRandom(3);
        Map<String, Long> truth = new HashMap<>();
        KeyIndex.Builder b = new KeyIndex.Builder();
        String[] byRow = new String[50_000];
        for (int row = 0; row < byRow.length; row++) {
            String key = "id-" + Long.toString(rng.nextLong(), 36);
            byRow[row] = key;
            truth.put(key, (long) row);
            b.add(key, row);
        }
        KeyIndex index = b.build();
        assertEquals(byRow.length, index.size());
        for (Map.Entry<String, Long> e : truth.entrySet()) {
            assertEquals(e.getValue(), index.find(e.getKey(), r -> byRow[(int) r]));
        }
        for (int i = 0; i < 1_000; i++) {
            assertEquals(-1, index.find("missing-" + i, r -> byRow[(int) r]));
        }
    }

    @Test
    void collidingHashesAreToldApartByTheIdItself() {
        // Two ids with the same 32-bit hash, found by search: the index must confirm by reading the id.
        Map<Integer, String> seen = new HashMap<>();
        String a = null;
        String c = null;
        for (int i = 0; a == null; i++) {
            String k = "k" + i;
            String other = seen.putIfAbsent(KeyIndex.hash(k), k);
            if (other != null) {
                a = other;
                c = k;
            }
        }
        String[] byRow = {"x", a, "y", c};
        KeyIndex.Builder b = new KeyIndex.Builder();
        for (int row = 0; row < byRow.length; row++) {
            b.add(byRow[row], row);
        }
        KeyIndex index = b.build();
        assertEquals(1, index.find(a, r -> byRow[(int) r]));
        assertEquals(3, index.find(c, r -> byRow[(int) r]));
    }
}
