package dev.dowser.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.io.IOException;
import java.io.StringReader;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/** The tokenizer against the rules and examples of RFC 4180, section 2. */
class CsvTokenizerTest {

    static List<List<String>> tokenize(String text, int bufferHint) throws IOException {
        CsvTokenizer t = new CsvTokenizer(new StringReader(text), 1_000);
        List<List<String>> out = new ArrayList<>();
        while (true) {
            List<String> rec = new ArrayList<>();
            if (!t.next((chars, off, n) -> rec.add(new String(chars, off, n)))) {
                return out;
            }
            out.add(rec);
        }
    }

    static List<List<String>> tokenize(String text) throws IOException {
        return tokenize(text, 0);
    }

    @Test
    void rule1RecordsEndInCrlf() throws IOException {
        // RFC 4180 2.1: aaa,bbb,ccc CRLF zzz,yyy,xxx CRLF
        assertEquals(List.of(List.of("aaa", "bbb", "ccc"), List.of("zzz", "yyy", "xxx")),
                tokenize("aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n"));
    }

    @Test
    void rule2LastRecordMayLackALineBreak() throws IOException {
        // RFC 4180 2.2: aaa,bbb,ccc CRLF zzz,yyy,xxx
        assertEquals(List.of(List.of("aaa", "bbb", "ccc"), List.of("zzz", "yyy", "xxx")),
                tokenize("aaa,bbb,ccc\r\nzzz,yyy,xxx"));
    }

    @Test
    void rule4SpacesArePartOfAField() throws IOException {
        // RFC 4180 2.4: "Spaces are considered part of a field and should not be ignored."
        assertEquals(List.of(List.of(" aaa", "bbb ", " ")), tokenize(" aaa,bbb , \n"));
    }

    @Test
    void rule5FieldsMayBeQuoted() throws IOException {
        // RFC 4180 2.5: "aaa","bbb","ccc" CRLF zzz,yyy,xxx
        assertEquals(List.of(List.of("aaa", "bbb", "ccc"), List.of("zzz", "yyy", "xxx")),
                tokenize("\"aaa\",\"bbb\",\"ccc\"\r\nzzz,yyy,xxx"));
    }

    @Test
    void rule6QuotedFieldsHoldLineBreaksAndCommas() throws IOException {
        // RFC 4180 2.6: "aaa","b CRLF bb","ccc" CRLF zzz,yyy,xxx
        assertEquals(List.of(List.of("aaa", "b\r\nbb", "ccc"), List.of("zzz", "yyy", "xxx")),
                tokenize("\"aaa\",\"b\r\nbb\",\"ccc\"\r\nzzz,yyy,xxx"));
        assertEquals(List.of(List.of("a,b", "c")), tokenize("\"a,b\",c\n"));
    }

    @Test
    void rule7QuotesInsideAreDoubled() throws IOException {
        // RFC 4180 2.7: "aaa","b""bb","ccc"
        assertEquals(List.of(List.of("aaa", "b\"bb", "ccc")), tokenize("\"aaa\",\"b\"\"bb\",\"ccc\""));
    }

    @Test
    void emptyFieldsAndLoneCrOrLfEndings() throws IOException {
        assertEquals(List.of(List.of("", "", ""), List.of("x", ""), List.of("y")), tokenize(",,\rx,\ny"));
    }

    @Test
    void blankLinesAreSkippedButCounted() throws IOException {
        CsvTokenizer t = new CsvTokenizer(new StringReader("a\n\n\r\nb\n"), 100);
        List<String> rec = new ArrayList<>();
        t.next((c, o, n) -> rec.add(new String(c, o, n)));
        t.next((c, o, n) -> rec.add(new String(c, o, n)));
        assertEquals(List.of("a", "b"), rec);
        assertEquals(4, t.recordLine());
    }

    @Test
    void linesAreCountedInsideQuotedFields() throws IOException {
        CsvTokenizer t = new CsvTokenizer(new StringReader("\"a\nb\r\nc\",d\ne\n"), 100);
        t.next((c, o, n) -> { });
        t.next((c, o, n) -> { });
        assertEquals(4, t.recordLine());
    }

    @Test
    void fieldsSpanningTheReadBufferAreWhole() throws IOException {
        String longField = "x".repeat(CsvTokenizer.BUFFER_CHARS + 17);
        CsvTokenizer t = new CsvTokenizer(new StringReader("a," + longField + "\n\"" + longField + "\"\n"),
                CsvTokenizer.BUFFER_CHARS * 2);
        List<String> rec = new ArrayList<>();
        t.next((c, o, n) -> rec.add(new String(c, o, n)));
        t.next((c, o, n) -> rec.add(new String(c, o, n)));
        assertEquals(List.of("a", longField, longField), rec);
    }

    @Test
    void fieldLimitIsEnforcedInBothForms() {
        assertThrows(ImportException.class, () -> new CsvTokenizer(new StringReader("123456\n"), 5)
                .next((c, o, n) -> { }));
        assertThrows(ImportException.class, () -> new CsvTokenizer(new StringReader("\"123456\"\n"), 5)
                .next((c, o, n) -> { }));
    }
}
