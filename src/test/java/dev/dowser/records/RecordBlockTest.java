package dev.dowser.records;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.util.HexFormat;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** The block layout and its encodings read back exactly what was written. */
class RecordBlockTest {

    @Test
    void varintMatchesTheLeb128Example() {
        // The unsigned LEB128 example of the DWARF 4 standard (section 7.6, figure 22) and its
        // common retellings: 624485 encodes as E5 8E 26 (value from memory of that example).
        ByteSink s = new ByteSink(8);
        s.putVarint(624_485);
        assertEquals("e58e26", HexFormat.of().formatHex(s.toArray()));
        assertEquals(624_485, new ByteSource(s.toArray(), 0).getVarint());
    }

    @Test
    void numberTextPacksAndUnpacksExactly() {
        SplittableRandom rng = new SplittableRandom(9);
        String alphabet = "0123456789.-+eE";
        for (int i = 0; i < 10_000; i++) {
            int n = rng.nextInt(1, NumberPack.MAX_CHARS + 1);
            StringBuilder t = new StringBuilder();
            for (int k = 0; k < n; k++) {
                t.append(alphabet.charAt(rng.nextInt(alphabet.length())));
            }
            char[] a = t.toString().toCharArray();
            ByteSink s = new ByteSink(8);
            assertTrue(NumberPack.tryWrite(a, 0, a.length, s));
            assertEquals(n / 2 + 1, s.size());
            assertEquals(t.toString(), NumberPack.read(new ByteSource(s.toArray(), 0), true));
        }
        ByteSink s = new ByteSink(8);
        char[] text = "12a".toCharArray();
        assertFalse(NumberPack.tryWrite(text, 0, text.length, s));
        assertEquals(0, s.size());
    }

    @Test
    void blockSectionsReadBack() throws IOException {
        RecordBatch b = RecordBatch.forWriting(3, new int[] {2, 0}, 8);
        String[][] rows = {{"r1", "x", "1.25"}, {"r2", null, "héllo, wörld"}, {"r3", "z", null}};
        for (int r = 0; r < rows.length; r++) {
            b.beginRecord(10 + r);
            for (String v : rows[r]) {
                b.field(v);
            }
            b.endRecord();
            byte[] raw = {(byte) r, 2, 3, 4};
            b.encoded(rows[r][0], r == 1 ? "yes" : null, raw, 4);
        }
        RecordBlock.Builder builder = new RecordBlock.Builder(2);
        builder.addAll(b);
        RecordBlock block = new RecordBlock(builder.seal());
        assertEquals(3, block.size());
        assertArrayEquals(new long[] {10, 11, 12}, block.lines());
        assertArrayEquals(new String[] {"r1", "r2", "r3"}, block.keys());
        assertArrayEquals(new String[] {null, "yes", null}, block.knownLabels());
        String[][] display = block.display(1, 3);
        assertArrayEquals(new String[] {"héllo, wörld", "r2"}, display[0]);
        assertArrayEquals(new String[] {null, "r3"}, display[1]);
        assertArrayEquals(new String[] {"1.25", "r1"}, block.display(0, 1)[0]);
        int[] seen = {0};
        block.features((i, bytes, off, len) -> {
            assertEquals(4, len);
            assertEquals(i, bytes[off]);
            seen[0]++;
        });
        assertEquals(3, seen[0]);

        String[][] chosen = block.display(new int[] {0, 2});
        assertArrayEquals(new String[] {"1.25", "r1"}, chosen[0]);
        assertArrayEquals(new String[] {null, "r3"}, chosen[1]);

        RecordBlock head = RecordBlock.readHead(new ByteArrayInputStream(builder.seal()));
        assertArrayEquals(block.keys(), head.keys());
        assertArrayEquals(display[0], head.display(new int[] {1})[0]);
        IllegalStateException noFeatures = assertThrows(IllegalStateException.class,
                () -> head.features((i, bytes, off, len) -> { }));
        assertEquals("this block was read without its features", noFeatures.getMessage());
    }

    @Test
    void missingFieldIsNull() {
        RecordBatch b = RecordBatch.forWriting(1, new int[] {0}, 2);
        b.beginRecord(1);
        b.field("");
        b.endRecord();
        assertNull(b.text(0, 0));
    }
}
