package dev.dowser.data;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.Test;

/** Keys that never trap a class named by a number: a one-character name is its own key. */
class LabelKeysTest {

    @Test
    void digitClassesKeepTheirOwnDigits() {
        // The classes of UCI's handwritten digits (as shipped by Debian's python3-sklearn): 0 to 9.
        List<String> digits = List.of("0", "1", "2", "3", "4", "5", "6", "7", "8", "9");
        assertEquals(digits, LabelKeys.keysFor(digits));
        // In any order: key 1 labels "1", never the first class.
        assertEquals(List.of("9", "0", "1"), LabelKeys.keysFor(List.of("9", "0", "1")));
    }

    @Test
    void namedClassesTakeTheFreeKeysInOrder() {
        assertEquals(List.of("1", "2", "3"), LabelKeys.keysFor(List.of("healthy", "imbalance", "cavitation")));
        // "2" keeps key 2, so the named classes around it skip it.
        assertEquals(List.of("1", "2", "3"), LabelKeys.keysFor(List.of("ok", "2", "fault")));
        assertEquals(List.of("1", "3", "2"), LabelKeys.keysFor(List.of("ok", "fault", "2")));
        // Letters are their own key in lower case; a second class wanting a taken key gets the next free one.
        assertEquals(List.of("b", "1", "a"), LabelKeys.keysFor(List.of("B", "b", "a")));
        // Non-ASCII and punctuation are not keys of their own.
        assertEquals(List.of("1", "2"), LabelKeys.keysFor(List.of("é", "-")));
    }

    @Test
    void keysRunOutAfterThirtyFive() {
        List<String> many = new ArrayList<>();
        for (int i = 0; i < 37; i++) {
            many.add("class-" + i);
        }
        List<String> keys = LabelKeys.keysFor(many);
        assertEquals("9", keys.get(8));
        assertEquals("a", keys.get(9));
        assertEquals("z", keys.get(34));
        assertEquals(Arrays.asList(null, null), keys.subList(35, 37));
    }
}
