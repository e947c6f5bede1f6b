package dev.dowser.data;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.json.Json;
import dev.dowser.store.Database;
import dev.dowser.store.RecordRow;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Column roles, feature encoding, and one clear message for each kind of bad input. */
class ImporterTest {

    @TempDir
    Path dir;
    Database db;

    @BeforeEach
    void open() {
        db = TestSupport.openDb(dir);
        // A pool already there: every failed import below must leave it, and everything else, alone.
        TestSupport.importText(db, "kept", "id,x,label\na,1,yes\nb,2,no\n",
                TestSupport.csv("kept").withId("id").withLabel("label"));
    }

    @AfterEach
    void close() {
        db.close();
    }

    private ImportException fails(String text, ImportSpec spec) {
        Map<String, Long> before = TestSupport.tableCounts(dir);
        ImportException e = assertThrows(ImportException.class, () -> TestSupport.importText(db, "p", text, spec));
        assertEquals(before, TestSupport.tableCounts(dir), "a failed import changed the database");
        return e;
    }

    private ImportException fails(String text) {
        return fails(text, TestSupport.csv("p"));
    }

    /**
     * Issue 11: 20,000 columns took 35-58 s, and each batch held 4,096 rows of field offsets (650 MiB
     * at this width). Here the file imports whole, a record's values come back in order, and a
     * missing column is named without listing twenty thousand. Speed: dowser bench --only import.
     */
    @Test
    void aFileOfTwentyThousandColumnsImports() {
        int cols = 20_000;
        StringBuilder csv = new StringBuilder("id");
        for (int c = 0; c < cols; c++) {
            csv.append(",c").append(c);
        }
        csv.append('\n');
        for (int r = 0; r < 5; r++) {
            csv.append('r').append(r);
            for (int c = 0; c < cols; c++) {
                csv.append(',').append((r * 7 + c) % 10);
            }
            csv.append('\n');
        }
        TestSupport.importText(db, "wide", csv.toString(), TestSupport.csv("wide").withId("id")
                .withClasses(List.of("a", "b")).withDisplay(List.of("c0", "c19999")));
        assertEquals(5, db.pools().require("wide").recordCount());
        FeatureSchema schema = Json.read(db.pools().require("wide").featureSchemaJson(), FeatureSchema.class);
        assertEquals(cols, schema.encodedWidth());
        RecordRow r3 = db.records().find(db.pools().require("wide").id(), "r3").orElseThrow();
        assertEquals(List.of("1", "0"), r3.display(), "r3's c0 is 21 % 10, its c19999 is 20020 % 10");
        ImportException missing = assertThrows(ImportException.class, () -> TestSupport.importText(db, "wide2",
                csv.toString(), TestSupport.csv("wide2").withId("nope").withClasses(List.of("a", "b"))));
        assertTrue(missing.getMessage().endsWith("c48 and 19951 more"), missing.getMessage());
    }

    @Test
    void defaultRolesUseEveryColumnButIdAndLabel() {
        TestSupport.importText(db, "p", "id,a,b,label\nr1,1,x,yes\nr2,2,y,no\n",
                TestSupport.csv("p").withId("id").withLabel("label"));
        ColumnRoles roles = Json.read(db.pools().require("p").columnRolesJson(), ColumnRoles.class);
        assertEquals(List.of("a", "b"), roles.features());
        assertEquals(List.of("a", "b"), roles.display());
        assertEquals(List.of("no", "yes"), db.pools().require("p").classes());
        RecordRow r = db.records().find(db.pools().require("p").id(), "r2").orElseThrow();
        assertEquals("no", r.label());
        assertEquals(3, r.sourceLine());
        assertEquals(List.of("2", "y"), r.display());
    }

    @Test
    void idsDefaultToLineNumbers() {
        TestSupport.importText(db, "p", "a\n1\n\n2\n", TestSupport.csv("p"));
        long pool = db.pools().require("p").id();
        assertEquals("2", db.records().page(pool, 0, 2).get(0).key());
        assertEquals("4", db.records().page(pool, 0, 2).get(1).key());
    }

    /**
     * Encoding, worked by hand: x = 1, 3, missing has mean 2 and population SD 1, so 1 and 3
     * standardise to -1 and 1, the missing value to 0 with its indicator set; colour is one-hot;
     * the embedding [1,2],[3,4],[5,6] has per-dimension means 3, 4 and SD sqrt(8/3).
     */
    @Test
    void encodesNumbersCategoriesEmbeddingsAndMissingValues() {
        TestSupport.importText(db, "p", "x,colour,e\n1,red,\"[1,2]\"\n3,blue,\"[3,4]\"\n,red,\"[5,6]\"\n",
                TestSupport.csv("p"));
        FeatureMatrix m = FeatureMatrix.load(db, "p");
        assertEquals(List.of("x", "x?missing", "colour=red", "colour=blue", "e[0]", "e[1]"),
                m.schema().encodedNames());
        double s = Math.sqrt(8.0 / 3);
        float[][] expected = {
            {-1, 0, 1, 0, (float) (-2 / s), (float) (-2 / s)},
            {1, 0, 0, 1, 0, 0},
            {0, 1, 1, 0, (float) (2 / s), (float) (2 / s)},
        };
        for (int i = 0; i < 3; i++) {
            float[] row = new float[6];
            System.arraycopy(m.values(), i * 6, row, 0, 6);
            assertArrayEquals(expected[i], row, 1e-6f, "row " + i);
        }
    }

    @Test
    void missingCategoryTakesTheLevelSharesAndItsIndicator() {
        TestSupport.importText(db, "p", "c\na\na\nb\n \n", TestSupport.csv("p"));
        FeatureMatrix m = FeatureMatrix.load(db, "p");
        assertEquals(List.of("c=a", "c=b", "c?missing"), m.schema().encodedNames());
        assertArrayEquals(new float[] {2f / 3, 1f / 3, 1}, new float[] {m.get(3, 0), m.get(3, 1), m.get(3, 2)}, 1e-6f);
    }

    @Test
    void readsJsonLinesWithMissingFieldsAndEmbeddings() {
        String text = "{\"id\":\"a\",\"t\":1.5,\"v\":[1,2,3],\"k\":\"yes\"}\n"
                + "{\"id\":\"b\",\"v\":[4,5,6],\"k\":null}\n";
        TestSupport.importText(db, "p", text, TestSupport.jsonl("p").withId("id").withLabel("k"));
        FeatureSchema s = Json.read(db.pools().require("p").featureSchemaJson(), FeatureSchema.class);
        assertEquals(FeatureKind.NUMERIC, s.columns().get(0).kind());
        assertEquals(1, s.columns().get(0).missing());
        assertEquals(FeatureKind.EMBEDDING, s.columns().get(1).kind());
        assertEquals(3, s.columns().get(1).dims());
        assertEquals(List.of("yes"), db.pools().require("p").classes());
    }

    @Test
    void acceptsAByteOrderMarkAndCrlfLines() {
        byte[] bom = {(byte) 0xEF, (byte) 0xBB, (byte) 0xBF};
        byte[] body = "a,b\r\n1,2\r\n".getBytes(StandardCharsets.UTF_8);
        byte[] all = new byte[bom.length + body.length];
        System.arraycopy(bom, 0, all, 0, 3);
        System.arraycopy(body, 0, all, 3, body.length);
        TestSupport.importBytes(db, all, TestSupport.csv("p"));
        ColumnRoles roles = Json.read(db.pools().require("p").columnRolesJson(), ColumnRoles.class);
        assertEquals(List.of("a", "b"), roles.features());
    }

    @Test
    void givenClassesFixTheLabelSetAndItsOrder() {
        TestSupport.importText(db, "p", "x,y\n1,low\n2,high\n",
                TestSupport.csv("p").withLabel("y").withClasses(List.of("low", "mid", "high")));
        assertEquals(List.of("low", "mid", "high"), db.pools().require("p").classes());
        ImportException e = fails("x,y\n1,low\n2,top\n",
                TestSupport.csv("q").withLabel("y").withClasses(List.of("low", "high")));
        assertEquals("line 3, column 'y': 'top' is not one of the classes low, high", e.getMessage());
    }

    @Test
    void numericLabelsAreOrderedAsNumbers() {
        TestSupport.importText(db, "p", "x,y\n1,10\n2,9\n3,1\n", TestSupport.csv("p").withLabel("y"));
        assertEquals(List.of("1", "9", "10"), db.pools().require("p").classes());
    }

    @Test
    void emptyFile() {
        assertEquals("the file is empty; a CSV file needs a header row naming its columns", fails("").getMessage());
    }

    @Test
    void headerWithoutRecords() {
        assertEquals("the file has no records after its header", fails("a,b\n").getMessage());
    }

    @Test
    void missingHeader() {
        assertEquals("line 1: the first line holds only numbers, so it looks like data, not a header;"
                + " add a header row naming the columns", fails("1,2\n3,4\n").getMessage());
    }

    @Test
    void raggedRow() {
        assertEquals("line 3: the record has 3 fields where the header has 2; quote fields that contain commas",
                fails("a,b\n1,2\n1,2,3\n").getMessage());
    }

    @Test
    void nonFiniteNumber() {
        assertEquals("line 3, column 'b': 'inf' is not a finite number; leave the field empty for a missing value",
                fails("a,b\n1,2\n3,inf\n").getMessage());
    }

    @Test
    void wrongType() {
        ImportException e = fails("a,b\n1,2\n3,abc\n");
        assertEquals(3, e.line());
        assertEquals("b", e.column());
        assertTrue(e.getMessage().startsWith("line 3, column 'b': expected a number, got 'abc'"), e.getMessage());
    }

    @Test
    void numberTooLargeForFloat32() {
        assertEquals("line 2, column 'a': '1e39' is too large for a 32-bit feature",
                fails("a\n1e39\n").getMessage());
    }

    @Test
    void duplicateIds() {
        ImportException e = fails("id,a\nx,1\ny,2\nx,3\n", TestSupport.csv("p").withId("id"));
        assertEquals("line 4, column 'id': duplicate id 'x' (first seen on line 2); every record needs its own id",
                e.getMessage());
    }

    @Test
    void emptyId() {
        assertEquals("line 3, column 'id': the id is empty; every record needs an id",
                fails("id,a\nx,1\n,2\n", TestSupport.csv("p").withId("id")).getMessage());
    }

    @Test
    void oversizedField() {
        String big = "9".repeat(ImportSpec.DEFAULT_MAX_FIELD_CHARS + 1);
        assertEquals("line 3: a field is longer than the limit of 100000 characters",
                fails("a\n1\n" + big + "\n").getMessage());
    }

    @Test
    void oversizedUpload() {
        ImportException e = fails("a\n" + "1\n".repeat(1000), TestSupport.csv("p").withLimits(50, 100, 64));
        assertEquals("the file is larger than the limit of 64 bytes", e.getMessage());
    }

    @Test
    void unclosedQuote() {
        assertEquals("line 3: a quoted field opened on this line is not closed before the end of the file",
                fails("a,b\n1,2\n3,\"four\n5,6\n").getMessage());
    }

    @Test
    void strayQuote() {
        assertTrue(fails("a,b\n1,2\n3,fo\"ur\n").getMessage().startsWith("line 3: a quote inside an unquoted field"));
        assertTrue(fails("a,b\n1,2\n3,\"fo\"ur\n").getMessage().startsWith("line 3: text after the closing quote"));
    }

    @Test
    void notUtf8() {
        byte[] bad = {'a', '\n', '1', '\n', (byte) 0xC3, (byte) 0x28, '\n'};
        Map<String, Long> before = TestSupport.tableCounts(dir);
        ImportException e = assertThrows(ImportException.class,
                () -> TestSupport.importBytes(db, bad, TestSupport.csv("p")));
        assertEquals("line 3: the file is not valid UTF-8 text (byte 0xC3 at byte 5); save it as UTF-8 and try again",
                e.getMessage());
        assertEquals(before, TestSupport.tableCounts(dir));
        // Far into a file, past the decoder's buffer, the line named is still the bad byte's.
        StringBuilder text = new StringBuilder("a\n");
        for (int i = 0; i < 30_000; i++) {
            text.append(i).append('\n');
        }
        byte[] head = text.toString().getBytes(java.nio.charset.StandardCharsets.UTF_8);
        byte[] far = java.util.Arrays.copyOf(head, head.length + 3);
        far[head.length] = (byte) 0xFF;
        far[head.length + 1] = '7';
        far[head.length + 2] = '\n';
        ImportException late = assertThrows(ImportException.class, () -> TestSupport.importBytes(db, far,
                TestSupport.csv("p").withClasses(List.of("x", "y"))));
        assertTrue(late.getMessage().startsWith("line 30002: the file is not valid UTF-8 text (byte 0xFF at byte "
                + (head.length + 1) + ")"), late.getMessage());
        // Text split anywhere across the buffer's edge decodes whole.
        String wide = "a\n" + "é✓😀\n".repeat(20_000);
        TestSupport.importText(db, "wide", wide, TestSupport.csv("wide").withClasses(List.of("x", "y")));
        assertEquals("é✓😀", db.records().page(db.pools().require("wide").id(), 19_999, 1).get(0).display().get(0));
    }

    @Test
    void tooManyCategories() {
        ImportException e = fails("c\na\nb\nc\n", TestSupport.csv("p").withLimits(2, 100, Long.MAX_VALUE));
        assertTrue(e.getMessage().startsWith("line 4, column 'c': more than 2 distinct values"), e.getMessage());
    }

    @Test
    void raggedEmbedding() {
        assertEquals("line 3, column 'e': the embedding has 3 numbers where line 2 set its length to 2",
                fails("e\n\"[1,2]\"\n\"[1,2,3]\"\n").getMessage());
    }

    @Test
    void unknownColumnsAreNamedWithTheChoices() {
        assertEquals("the label column 'lbl' is not in the file; its columns are: a, b",
                fails("a,b\n1,2\n", TestSupport.csv("p").withLabel("lbl")).getMessage());
    }

    @Test
    void existingPoolName() {
        assertEquals("a pool named 'kept' already exists; choose another pool name",
                assertThrows(ImportException.class,
                        () -> TestSupport.importText(db, "kept", "a\n1\n", TestSupport.csv("kept"))).getMessage());
    }

    @Test
    void jsonLinesProblemsNameTheLine() {
        assertEquals("line 2, column 'z': this field is not among the fields of the first line (a)",
                fails("{\"a\":1}\n{\"z\":2}\n", TestSupport.jsonl("p")).getMessage());
        assertTrue(fails("{\"a\":1}\n{\"a\":\n", TestSupport.jsonl("p")).getMessage().startsWith("line 2: malformed JSON"));
        assertEquals("line 2, column 'a': an embedding must be an array of numbers only",
                fails("{\"a\":1}\n{\"a\":[\"x\"]}\n", TestSupport.jsonl("p")).getMessage());
        // An object is kept as its JSON text, shown as it is.
        TestSupport.importText(db, "objects", "{\"id\":\"r1\",\"who\":{\"ana\":\"ok\"}}\n",
                TestSupport.jsonl("objects").withId("id").withClasses(List.of("ok", "bad")).withDisplay(List.of("who")));
        assertEquals("{\"ana\":\"ok\"}", db.records().find(db.pools().require("objects").id(), "r1").orElseThrow()
                .display().get(0));
    }
}
