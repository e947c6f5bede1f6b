package dev.dowser.web;

import static dev.dowser.web.Gen.w;

import java.util.List;

/**
 * Strings that break careless code: control characters, long runs, the Unicode that trips text
 * handling (lone and paired surrogates, right-to-left and bidirectional controls, zero-width and
 * odd spaces, combining marks, noncharacters), injection forms (SQL, HTML, CSV formulas, paths,
 * format strings), numbers at and past the limits of int, long and double, and broken JSON and
 * CSV structure. The kinds come from common practice in input testing (the OWASP testing guide's
 * injection classes; Unicode's own list of surrogates, bidi and format characters, from memory).
 */
final class HostileText {

    private HostileText() {
    }

    /** Single characters, by kind; a kind is drawn first so that the rare ones are not drowned. */
    static final List<String> CONTROL = List.of("\u0000", "\u0001", "\u0007", "\b", "\t", "\n", "\u000b", "\f", "\r",
            "\u001b", "\u001f", "\u007f", "\u0080", "\u0085", "\u009f");
    static final List<String> SPACES = List.of(" ", "\u00a0", "\u1680", "\u2000", "\u2007", "\u2028", "\u2029",
            "\u202f", "\u3000");
    static final List<String> ZERO_WIDTH = List.of("\u200b", "\u200c", "\u200d", "\u2060", "\ufeff", "\u00ad",
            "\u180e");
    static final List<String> BIDI = List.of("\u200e", "\u200f", "\u202a", "\u202b", "\u202c", "\u202d", "\u202e",
            "\u2066", "\u2067", "\u2068", "\u2069", "\u061c", "שלום", "مرحبا", "\u05d0\u202e\u05d1");
    /** Lone high and low surrogates, a reversed pair, valid pairs (emoji, the last code point, a flag). */
    static final List<String> SURROGATES = List.of("\ud800", "\udbff", "\udc00", "\udfff", "\udc00\ud800",
            "\ud83d\ude00", "\udbff\udfff", "\ud83c\uddfa\ud83c\uddf3", "\ud800x", "x\udc00");
    static final List<String> ODD_LETTERS = List.of("e\u0301", "\u0301", "a" + "\u0300".repeat(30), "\ufffd",
            "\ufffe", "\uffff", "\ufdd0", "ǅ", "ß", "İ", "ﬃ", "Ω", "名前", "Ünïcödé", "\u0130i\u0307");

    static final List<String> INJECTION = List.of(
            // SQL
            "' OR '1'='1", "'; DROP TABLE labels; --", "\" OR 1=1 --", "1; SELECT pg_sleep(5)", "%' AND 1=1 --",
            "') UNION SELECT name, password_hash FROM users --", "\\'", "''", "/*", "*/",
            // HTML and script
            "<script>alert(1)</script>", "<img src=x onerror=alert(1)>", "\"><svg onload=alert(1)>", "</textarea>",
            "&lt;b&gt;", "&#0;", "javascript:alert(1)", "<!--", "]]>",
            // CSV formulas (the cells a spreadsheet would run)
            "=cmd|' /C calc'!A0", "=HYPERLINK(\"http://x\",\"y\")", "+1+1", "-2+3", "@SUM(1,1)", "\t=1", "\r=1",
            // paths, URLs, format strings, templates
            "../../etc/passwd", "..\\..\\boot.ini", "%00", "%2e%2e%2f", "%", "%s%s%s%n", "{0}", "${jndi:ldap://x/a}",
            "#{7*7}", "{{7*7}}", "\\u0000", "\\");

    static final List<String> NUMBERS = List.of("2147483647", "2147483648", "-2147483648", "-2147483649",
            "9223372036854775807", "9223372036854775808", "-9223372036854775808", "-9223372036854775809",
            "1.7976931348623157E308", "1.8e308", "-1.8e308", "4.9e-324", "2e-324", "1e-400", "1e999", "-0", "-0.0",
            "0.0", "NaN", "-NaN", "Infinity", "-Infinity", "inf", "0x7fffffff", "0x1p3", "1_000", "1,000.5", "1.5.5",
            "1e", "1e+", ".", "-", "+", "+-1", "00012", "١٢٣", "１２", "1\u00a0000", "³", "123456789012345678901234567890",
            "0." + "0".repeat(400) + "1");

    static final List<String> BROKEN_JSON = List.of("{", "}", "[", "]", "{\"a\":", "{\"a\":1,}", "[1,]", "{'a':1}",
            "\"\\ud800\"", "\"\\u00\"", "\"\\x41\"", "{\"a\":1}{", "nul", "tru", "{\"a\" 1}", "\"unterminated",
            "{\"a\":1,\"a\":2}", "[".repeat(600), "{\"a\":".repeat(300), "\"\\", "\u0000{}", "/* c */{}");

    static final List<String> BROKEN_CSV = List.of("\"abc", "a\"b", "\"\"\"", "\"a\"b\"", ",,,", "\"\r\n\"", "\r\n",
            "\n\r", "a,\"b\nc", "\"a\",\"", "\\,", ";", "\t", "\"\",\"\"");

    /** One character or short sequence of a hostile kind. */
    static Gen<String> piece() {
        return Gen.frequency(w(3, Gen.ints(' ', '~').map(c -> String.valueOf((char) c.intValue()))),
                w(2, Gen.of(CONTROL)), w(1, Gen.of(SPACES)), w(1, Gen.of(ZERO_WIDTH)), w(1, Gen.of(BIDI)),
                w(1, Gen.of(SURROGATES)), w(1, Gen.of(ODD_LETTERS)),
                // Any UTF-16 unit at all, surrogates and noncharacters included.
                w(2, Gen.ints(0, 0xFFFF).map(c -> String.valueOf((char) c.intValue()))),
                w(1, Gen.ints(0x10000, Character.MAX_CODE_POINT).map(Character::toString)));
    }

    /** A long run: one piece or token repeated hundreds to thousands of times. */
    static Gen<String> run() {
        return Gen.frequency(w(3, piece()), w(1, Gen.of(INJECTION)), w(1, Gen.of(BROKEN_JSON)),
                        w(1, Gen.of(BROKEN_CSV)))
                .flatMap(unit -> Gen.ints(100, 5_000).map(n -> unit.repeat(Math.max(1, n / Math.max(1, unit.length())))));
    }

    /** Text up to about {@code maxPieces} pieces long, joined from hostile pieces, tokens and now and then a long run. */
    static Gen<String> text(int maxPieces) {
        Gen<String> part = Gen.frequency(w(12, piece().list(1, 8).map(l -> String.join("", l))),
                w(2, Gen.of(INJECTION)), w(2, Gen.of(NUMBERS)), w(1, Gen.of(BROKEN_JSON)), w(1, Gen.of(BROKEN_CSV)),
                w(1, run()));
        return part.list(0, maxPieces).map(l -> String.join("", l));
    }

    /** Text of {@code min} to {@code max} characters from {@code lo} to {@code hi} (e.g. printable ASCII). */
    static Gen<String> chars(char lo, char hi, int min, int max) {
        return r -> {
            int n = min + r.nextInt(max - min + 1);
            StringBuilder s = new StringBuilder(n);
            for (int i = 0; i < n; i++) {
                s.append((char) (lo + r.nextInt(hi - lo + 1)));
            }
            return s.toString();
        };
    }

    /** A token of one hostile kind, whole: the values a field is most likely to choke on. */
    static Gen<String> token() {
        return Gen.frequency(w(3, Gen.of(INJECTION)), w(3, Gen.of(NUMBERS)), w(2, Gen.of(BROKEN_JSON)),
                w(2, Gen.of(BROKEN_CSV)), w(1, Gen.of(SURROGATES)), w(1, Gen.of(BIDI)), w(1, Gen.of(ZERO_WIDTH)),
                w(1, Gen.of(CONTROL)));
    }
}
