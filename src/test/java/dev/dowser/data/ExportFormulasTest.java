package dev.dowser.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.store.Database;
import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * CSV injection (OWASP, "CSV Injection"): a field that starts with = + - @, a tab or a carriage
 * return is run as a formula by spreadsheets. The export writes it with a ' in front unless asked
 * to keep it; numbers stay numbers; JSON Lines is never changed.
 */
class ExportFormulasTest {

    /** Display values as a hostile file might carry them, and how the export must write each. */
    static final String[][] CASES = {
        {"=HYPERLINK(\"http://x.example\",\"open\")", "\"'=HYPERLINK(\"\"http://x.example\"\",\"\"open\"\")\""},
        {"+1+2", "'+1+2"},
        {"-2+3", "'-2+3"},
        {"@SUM(A1:A9)", "'@SUM(A1:A9)"},
        {"\tx", "'\tx"},
        {"-3.5", "-3.5"},
        {"+1e5", "+1e5"},
        {".25", ".25"},
        {"a=b", "a=b"},
    };

    @TempDir
    Path dir;

    @Test
    void formulaFieldsAreEscapedUnlessKept() {
        StringBuilder csv = new StringBuilder("id,shown,x,grade\n");
        for (int i = 0; i < CASES.length; i++) {
            csv.append("r").append(i).append(",\"").append(CASES[i][0].replace("\"", "\"\"")).append("\",")
                    .append(i).append(",ok\n");
        }
        try (Database db = TestSupport.openDb(dir)) {
            TestSupport.importText(db, "p", csv.toString(), TestSupport.csv("p").withId("id").withLabel("grade")
                    .withFeatures(List.of("x")).withDisplay(List.of("shown")));
            List<String> escaped = lines(db, FileFormat.CSV, Exporter.Formulas.ESCAPE);
            List<String> kept = lines(db, FileFormat.CSV, Exporter.Formulas.KEEP);
            for (int i = 0; i < CASES.length; i++) {
                String want = "r" + i + "," + CASES[i][1] + ",ok,single,";
                assertTrue(escaped.get(i + 1).startsWith(want), "case " + i + ": " + escaped.get(i + 1));
                String exact = CASES[i][0].contains("\"") ? "\"" + CASES[i][0].replace("\"", "\"\"") + "\"" : CASES[i][0];
                assertTrue(kept.get(i + 1).startsWith("r" + i + "," + exact + ",ok,"), "case " + i + ": " + kept.get(i + 1));
            }
            String jsonl = String.join("\n", lines(db, FileFormat.JSONL, Exporter.Formulas.ESCAPE));
            assertTrue(jsonl.contains("\"shown\":\"+1+2\""), jsonl);
            assertFalse(jsonl.contains("'"), "JSON Lines is written exactly");
        }
    }

    @Test
    void theRuleIsTheTriggerCharactersLessPlainNumbers() {
        for (String f : List.of("=1", "+x", "-x", "@x", "\tx", "\rx", "-1-1", "+", "-")) {
            assertTrue(Exporter.runsAsFormula(f), f);
        }
        for (String f : List.of("", "x=1", "-1", "+2.5", "-.5", "1e9", "-4E-3", " =1")) {
            assertFalse(Exporter.runsAsFormula(f), f);
        }
        assertEquals("unknown formulas choice 'strip': use escape or keep",
                org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                        () -> Exporter.Formulas.parse("strip")).getMessage());
    }

    private static List<String> lines(Database db, FileFormat format, Exporter.Formulas formulas) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        new Exporter(db).export("p", format, formulas, out);
        // The tab case holds no line break, so each record is one line.
        return List.of(out.toString(StandardCharsets.UTF_8).split("\r?\n"));
    }
}
