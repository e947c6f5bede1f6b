package dev.dowser.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayInputStream;
import java.nio.charset.StandardCharsets;
import java.util.List;
import org.junit.jupiter.api.Test;

/** What the mapping step suggests from the head of a file: ids, labels, features, and what it counts. */
class PreviewTest {

    private static Preview of(String csv) {
        return Preview.of(new ByteArrayInputStream(csv.getBytes(StandardCharsets.UTF_8)), FileFormat.CSV,
                Preview.DEFAULT_ROWS);
    }

    @Test
    void commonIdNamesAreSuggestedWhenTheirValuesAreAllDifferent() {
        assertEquals("row_id", of("x,row_id,target\n1.5,7,a\n2.5,8,b\n").suggested().id());
        assertEquals("Sample ID", of("Sample ID,x\ns1,1\ns2,2\n").suggested().id());
        assertEquals("recordId", of("recordId,x\nr1,1\nr2,2\n").suggested().id());
        // Named like an id but repeated: not an id.
        assertNull(of("id,x\n1,1.5\n1,2.5\n").suggested().id());
        // Ending in "id" inside a word is not a name for an id; unique decimals are measurements.
        assertNull(of("humid,fluid\n0.51,1.5\n0.62,2.5\n").suggested().id());
    }

    @Test
    void aColumnOfAllDifferentIdLikeValuesIsSuggestedWithoutAnIdName() {
        assertEquals("reading", of("reading,rpm\nKW-000001,1450.5\nKW-000002,1460.5\n").suggested().id());
        // Whole numbers counting up, as the index column a data frame writes.
        assertEquals("n", of("n,x,y\n0,1.5,a\n1,2.5,b\n2,0.5,a\n").suggested().id());
        assertNull(of("n,x\n3,1.5\n1,2.5\n").suggested().id(), "whole numbers out of order are values");
        // Free text with spaces is for reading, not an id.
        assertNull(of("remark,x\nloud hum,2\nquiet,1\n").suggested().id());
    }

    @Test
    void countsTellAFullyLabelledFileAndKindsIncludeArrays() {
        Preview p = of("id,target,trace,station\na,yes,\"[1,2,3]\",North\nb,no,\"[2,3,4]\",South\nc,yes,\"[0,1,2]\",North\n");
        assertEquals("target", p.suggested().label());
        assertEquals(3, p.sampled());
        assertEquals(3, p.filled().get(1), "every sampled record carries a label");
        assertEquals(2, p.distinct().get(1));
        assertEquals(List.of("text", "text", "numbers", "text"), p.kinds());
        assertEquals(List.of("trace"), p.suggested().features(), "an array of numbers is a feature");
        assertTrue(p.unique(0));
        assertFalse(p.unique(3));
        Preview partly = of("id,target\na,yes\nb,\n");
        assertEquals(1, partly.filled().get(1));
    }
}
