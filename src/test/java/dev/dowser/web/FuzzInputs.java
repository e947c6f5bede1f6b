package dev.dowser.web;

import static dev.dowser.web.Gen.w;

import java.net.URLEncoder;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;

/**
 * The generators of {@link EdgeFuzzTest}: files that are nearly right (real headers and rows with
 * hostile fields, then cut, spliced or sprayed with bytes), plain noise, the import's and the
 * preview's parameters, and JSON bodies built from the API's own field names with values of every
 * type, sent by an admin, a labeller or nobody. Nearly-right input reaches deep into the code;
 * noise keeps the first checks honest.
 */
final class FuzzInputs {

    private FuzzInputs() {
    }

    /** A file and the query of the call that sends it. */
    record Upload(String query, byte[] body) {
        int size() {
            return query.length() + body.length;
        }

        @Override
        public String toString() {
            return "query " + query + ", body (" + body.length + " bytes):\n"
                    + new String(body, 0, Math.min(body.length, 2_000), StandardCharsets.UTF_8);
        }
    }

    /** One API call with a JSON body (or something that should be one). */
    record Call(String caller, String method, String path, byte[] body) {
        int size() {
            return path.length() + body.length;
        }

        @Override
        public String toString() {
            return caller + " " + method + " " + path + " " + new String(body, StandardCharsets.UTF_8);
        }
    }

    // ---- files ---------------------------------------------------------------------------------

    /** Column names: plain, repeated, empty, quoted, numeric-looking, long, non-ASCII, hostile. */
    static Gen<String> columnName() {
        return Gen.frequency(
                w(6, Gen.of("id", "flow", "site", "label", "trace", "note", "x", "y", "class")),
                w(2, Gen.of("", " ", "\"a,b\"", "\"q\"\"q\"", "1", "2.5", "Ünï", "名前", "a\tb", "id ")),
                w(1, HostileText.chars(' ', '~', 1, 300)),
                w(1, HostileText.text(3)));
    }

    /** Field values: numbers of every spelling, missing tokens, JSON arrays, quotes, breaks, control characters. */
    static Gen<String> field() {
        return Gen.frequency(
                w(6, Gen.doubles(-1e6, 1e6, -1).map(d -> Double.toString(d))),
                w(3, Gen.of("ok", "fault", "north", "south", "a", "b", "c")),
                w(3, Gen.of("", "NaN", "inf", "-Infinity", "1e999", "-0", "0x1F", "1,5", "?", "NA",
                        "null", "true", "[1,2,3]", "[1,", "[]", "[[1]]", "[\"a\"]", "{\"a\":1}", "\"", "a\"b",
                        "two\nlines", "x,y", "=cmd|' /C calc'!A0", "\u0000", "\u001b[31m",
                        "\uFEFF", "\uD83D\uDE00", "\r", "9".repeat(400))),
                w(1, HostileText.token()),
                w(1, HostileText.text(6)));
    }

    /** What a column holds: numbers (some missing), words, arrays of numbers of one length, or anything at all. */
    enum Kind { NUMBER, WORD, EMBEDDING, ANYTHING }

    /** A value of a column of {@code kind}; embeddings have {@code width} numbers. */
    static Gen<String> value(Kind kind, int width) {
        return switch (kind) {
            case NUMBER -> Gen.frequency(
                    w(12, Gen.doubles(-1e6, 1e6, 3).map(d -> Double.toString(d))),
                    w(2, Gen.ints(-1000, 1000).map(i -> Integer.toString(i))),
                    w(1, Gen.of("", "NA", "?", "1e5", "-0", ".5", "NaN", "1e999")),
                    w(1, Gen.of(HostileText.NUMBERS)));
            case WORD -> Gen.frequency(
                    w(10, Gen.of("north", "south", "east", "west", "pump a", "Ünïcödé ✓", "名前")),
                    w(2, Gen.of("", "say \"hi\"", "a, b", "two\nlines", "=SUM(A1)", " padded ")),
                    w(1, HostileText.text(3).map(t -> t.isEmpty() ? "w" : t)));
            case EMBEDDING -> Gen.frequency(
                    w(12, Gen.doubles(-5, 5, 2).list(width)
                            .map(l -> "[" + String.join(",", l.stream().map(d -> Double.toString(d)).toList()) + "]")),
                    w(1, Gen.of("[]", "[1,", "[\"a\"]", "[[1]]", "", "[1e999]", "[NaN]", "[1e308,-1e308]")));
            case ANYTHING -> field();
        };
    }

    /** A table: distinct column names, a kind per column, 1 to 12 rows, perhaps a label column. */
    record Table(List<String> names, List<List<String>> rows, boolean hasLabel) {
    }

    static Gen<Table> table() {
        Gen<List<String>> names = Gen.frequency(
                w(10, Gen.of("flow", "site", "trace", "note", "speed_mm_s", "grade", "when", "x").uniqueList(1, 6)),
                w(1, columnName().list(1, 6)));
        Gen<Kind> kind = Gen.frequency(w(6, Gen.constant(Kind.NUMBER)), w(3, Gen.constant(Kind.WORD)),
                w(1, Gen.constant(Kind.EMBEDDING)), w(1, Gen.constant(Kind.ANYTHING)));
        Gen<String> labelValue = Gen.frequency(w(5, Gen.of("ok", "fault")), w(2, Gen.constant("")),
                w(1, Gen.of("maybe", " ok ")));
        return r -> {
            List<String> cols = names.next(r);
            boolean label = r.nextBoolean();
            // One row now and then, as often as the bounds themselves come up in hand-picked tests.
            int n = r.nextInt(5) == 0 ? 1 : 1 + r.nextInt(12);
            List<Gen<String>> perColumn = new ArrayList<>();
            for (int c = 0; c < cols.size(); c++) {
                perColumn.add(value(kind.next(r), 1 + r.nextInt(4)));
            }
            if (label) {
                perColumn.add(labelValue);
            }
            List<String> header = new ArrayList<>(cols);
            if (label) {
                header.add("label");
            }
            List<List<String>> rows = new ArrayList<>(n);
            for (int i = 0; i < n; i++) {
                rows.add(perColumn.stream().map(g -> g.next(r)).toList());
            }
            return new Table(header, rows, label);
        };
    }

    /**
     * A CSV file of a {@link #table()}, with any line ends and perhaps a byte order mark. Most are
     * written as a careful program would (fields quoted where RFC 4180 needs it); the rest join the
     * raw values, as a careless one would, and a few rows may be short or long.
     */
    static Gen<String> csv() {
        return table().flatMap(FuzzInputs::csv);
    }

    static Gen<String> csv(Table t) {
        Gen<String> ends = Gen.of("\n", "\r\n", "\r");
        Gen<String> boms = Gen.of("", "\uFEFF");
        Gen<Integer> raggedness = Gen.frequency(w(1, Gen.constant(-1)), w(20, Gen.constant(0)), w(1, Gen.constant(1)));
        Gen<Boolean> carefulness = Gen.frequency(w(15, Gen.constant(true)), w(1, Gen.constant(false)));
        return r -> {
            String end = ends.next(r);
            String bom = boms.next(r);
            int ragged = raggedness.next(r);
            boolean careful = carefulness.next(r);
            StringBuilder s = new StringBuilder(bom).append(row(t.names(), careful)).append(end);
            for (List<String> row : t.rows()) {
                List<String> cells = new ArrayList<>(row);
                if (ragged < 0 && !cells.isEmpty()) {
                    cells.remove(cells.size() - 1);
                } else if (ragged > 0) {
                    cells.add("extra");
                }
                s.append(row(cells, careful)).append(end);
            }
            return s.toString();
        };
    }

    private static String row(List<String> values, boolean careful) {
        if (!careful) {
            return String.join(",", values);
        }
        List<String> out = new ArrayList<>(values.size());
        for (String v : values) {
            boolean quote = v.indexOf(',') >= 0 || v.indexOf('"') >= 0 || v.indexOf('\n') >= 0 || v.indexOf('\r') >= 0;
            out.add(quote ? "\"" + v.replace("\"", "\"\"") + "\"" : v);
        }
        return String.join(",", out);
    }

    /** A JSON Lines file of a {@link #table()}: numbers as numbers, arrays as arrays, missing as null or absent. */
    static Gen<String> jsonLinesOfTable() {
        return table().flatMap(FuzzInputs::jsonLines);
    }

    static Gen<String> jsonLines(Table t) {
        Gen<Boolean> cleanness = Gen.frequency(w(15, Gen.constant(true)), w(1, Gen.constant(false)));
        return r -> {
            boolean clean = cleanness.next(r);
            StringBuilder s = new StringBuilder();
            for (List<String> row : t.rows()) {
                List<String> parts = new ArrayList<>();
                for (int c = 0; c < row.size(); c++) {
                    String v = row.get(c);
                    if (v.isEmpty() && clean && c > 0) {
                        continue;
                    }
                    boolean raw = v.startsWith("[") || v.matches("-?\\d+(\\.\\d+)?") || v.equals("null");
                    parts.add(quote(t.names().get(c)) + ":" + (raw || !clean ? v.isEmpty() ? "null" : v : quote(v)));
                }
                s.append("{").append(String.join(",", parts)).append("}\n");
            }
            return s.toString();
        };
    }

    /** A JSON value as text, nested at most {@code depth} more levels. */
    static Gen<String> jsonValue(int depth) {
        Gen<String> leaf = Gen.frequency(
                w(4, Gen.doubles(-1e9, 1e9, -1).map(d -> Double.toString(d))),
                w(3, Gen.anyInt().map(i -> Integer.toString(i))),
                w(3, field().map(FuzzInputs::quote)),
                w(2, Gen.of("null", "true", "false", "1e999", "-1e999", "123456789012345678901234567890",
                        "0.1e-400", "\"\\ud800\"", "\"\\u0000\"", "-0")),
                w(1, Gen.of(HostileText.NUMBERS)),
                w(1, Gen.of(HostileText.BROKEN_JSON)));
        if (depth <= 0) {
            return leaf;
        }
        return Gen.frequency(w(3, leaf),
                w(1, r -> "[" + String.join(",", jsonValue(depth - 1).list(0, 4).next(r)) + "]"),
                w(1, r -> "{" + String.join(",", member(columnName(), jsonValue(depth - 1)).list(0, 4).next(r)) + "}"));
    }

    static Gen<String> jsonValue() {
        return jsonValue(3);
    }

    static Gen<String> member(Gen<String> key, Gen<String> value) {
        return r -> quote(key.next(r)) + ":" + value.next(r);
    }

    /** A JSON Lines file: objects over a few keys, some lines broken. */
    static Gen<String> jsonLines() {
        Gen<String> line = Gen.frequency(
                w(8, member(columnName(), jsonValue()).list(1, 6).map(l -> "{" + String.join(",", l) + "}")),
                w(1, jsonValue()),
                w(1, Gen.of("", "{", "}", "{\"a\":", "not json", "{\"a\":1}{\"b\":2}", "\uFEFF{}")),
                w(1, Gen.of(HostileText.BROKEN_JSON)));
        return line.list(0, 10).map(l -> String.join("\n", l) + "\n");
    }

    /** Bytes changed the ways files get damaged: cut, spliced, overwritten, sprayed with non-UTF-8. */
    static Gen<byte[]> damaged(Gen<String> text) {
        return r -> {
            byte[] b = text.next(r).getBytes(StandardCharsets.UTF_8);
            return switch (r.nextInt(16)) {
                case 1 -> Arrays.copyOf(b, b.length == 0 ? 0 : r.nextInt(b.length));
                case 2 -> {
                    for (int k = 0; k < 3 && b.length > 0; k++) {
                        b[r.nextInt(b.length)] = (byte) r.nextInt(256);
                    }
                    yield b;
                }
                case 3 -> splice(b, r, new byte[] {(byte) 0xC3, (byte) 0x28, (byte) 0xFF, (byte) 0xFE});
                case 4 -> splice(b, r, "\",\"\n\"".getBytes(StandardCharsets.UTF_8));
                // CESU-style bytes of a lone surrogate and an overlong NUL: not UTF-8 either.
                case 5 -> splice(b, r, new byte[] {(byte) 0xED, (byte) 0xA0, (byte) 0x80, (byte) 0xC0, (byte) 0x80});
                default -> b;
            };
        };
    }

    private static byte[] splice(byte[] b, SplittableRandom r, byte[] add) {
        int at = b.length == 0 ? 0 : r.nextInt(b.length + 1);
        byte[] out = new byte[b.length + add.length];
        System.arraycopy(b, 0, out, 0, at);
        System.arraycopy(add, 0, out, at, add.length);
        System.arraycopy(b, at, out, at + add.length, b.length - at);
        return out;
    }

    /** A file's body and the kind of file it was made as (csv, jsonl, or bin for noise). */
    record File(String kind, byte[] body) {
    }

    /** The body of an upload: a CSV or JSON Lines file, now and then damaged, or noise. */
    static Gen<File> file() {
        return Gen.frequency(
                w(6, damaged(csv()).map(b -> new File("csv", b))),
                w(3, damaged(jsonLinesOfTable()).map(b -> new File("jsonl", b))),
                w(1, damaged(jsonLines()).map(b -> new File("jsonl", b))),
                w(1, Gen.bytes(600).map(b -> new File("bin", b))));
    }

    /** Upload parameters: a pool name, a file name, and column roles taken from names that may or may not be there. */
    static Gen<String> importQuery(String kind) {
        Gen<String> names = Gen.frequency(w(3, Gen.constant("")),
                w(1, columnName().list(0, 4).map(l -> String.join(",", l))));
        Gen<String> pool = Gen.frequency(
                w(12, HostileText.chars('a', 'z', 1, 12)),
                w(1, Gen.of("", "p", "../x", "a b", "Ünï", "x".repeat(300), "con", "%00")),
                w(1, HostileText.token()));
        Gen<String> number = Gen.frequency(w(8, Gen.constant("")),
                w(1, Gen.of("0", "1", "2", "16", "50", "-5", "99999999999", "x", "1.5")),
                w(1, Gen.of(HostileText.NUMBERS)));
        Gen<String> classes = Gen.frequency(w(6, Gen.of("ok,fault", "a,b,c")),
                w(2, Gen.constant("")), w(1, Gen.of("a,a", " ", "x".repeat(250), ",,")));
        Gen<String> ext = Gen.of(kind, kind, kind, "csv", "jsonl", "json", "txt", "");
        Gen<String> id = Gen.frequency(w(6, Gen.constant("")), w(1, Gen.of("id", "flow", "nope", "label", "x")));
        Gen<String> label = Gen.frequency(w(3, Gen.constant("")), w(4, Gen.constant("label")),
                w(1, Gen.of("class", "id", "nope", "y")));
        return r -> {
            StringBuilder q = new StringBuilder("pool=").append(enc(pool.next(r))).append("&file_name=f.")
                    .append(enc(ext.next(r)));
            q.append("&features=").append(enc(names.next(r))).append("&display=").append(enc(names.next(r)));
            q.append("&classes=").append(enc(classes.next(r))).append("&categorical=").append(enc(names.next(r)));
            q.append("&max_levels=").append(enc(number.next(r))).append("&max_field_chars=").append(enc(number.next(r)));
            String i = id.next(r);
            String l = label.next(r);
            return q + (i.isEmpty() ? "" : "&id=" + i) + (l.isEmpty() ? "" : "&label=" + l);
        };
    }

    /**
     * Uploads: mostly a table written as CSV or JSON Lines with parameters that fit it (the label
     * column named when there is one, else the classes; now and then a choice of features), so that
     * many imports succeed and the checks past the first are reached; the rest anything at all.
     */
    static Gen<Upload> uploads() {
        Gen<Upload> fitting = table().flatMap(t -> {
            Gen<File> f = Gen.frequency(w(2, damaged(csv(t)).map(b -> new File("csv", b))),
                    w(1, damaged(jsonLines(t)).map(b -> new File("jsonl", b))));
            Gen<String> query = fittingQuery(t);
            return r -> {
                File file = f.next(r);
                return new Upload("file_name=f." + file.kind() + "&" + query.next(r), file.body());
            };
        });
        Gen<Upload> any = file().flatMap(f -> importQuery(f.kind()).map(q -> new Upload(q, f.body())));
        return Gen.frequency(w(7, fitting), w(3, any));
    }

    /** Parameters that fit the table, but for a slip now and then. */
    static Gen<String> fittingQuery(Table t) {
        List<String> columns = t.names().stream().filter(n -> !n.equals("label")).toList();
        // Now and then a name taken already: the fixture's pool, or one an earlier input made.
        Gen<String> pool = Gen.frequency(w(30, HostileText.chars('a', 'z', 1, 12)), w(1, Gen.of("p", "again", "a")));
        Gen<String> labelPart = t.hasLabel()
                ? Gen.frequency(w(8, Gen.constant("&label=label")),
                        w(1, Gen.constant("&label=label&classes=ok,fault")),
                        w(1, Gen.constant("&classes=ok,fault")))
                : Gen.frequency(w(9, Gen.of("&classes=ok,fault", "&classes=a,b,c")),
                        w(1, Gen.constant("&label=label")));
        Gen<String> subset = Gen.subsetOf(columns).map(sub -> String.join(",", sub));
        // A table may hold nothing but its label column: then a column to name is one it lacks.
        Gen<String> column = columns.isEmpty() ? Gen.constant("nope") : Gen.of(columns);
        Gen<String> roles = Gen.frequency(w(6, Gen.constant("")),
                w(1, subset.map(f -> "&features=" + enc(f))),
                w(1, subset.map(f -> "&display=" + enc(f))),
                w(1, column.map(c -> "&features=" + enc(c) + "&categorical=" + enc(c))),
                w(1, column.map(c -> "&id=" + enc(c))));
        Gen<String> limits = Gen.frequency(w(9, Gen.constant("")),
                w(1, Gen.of("&max_levels=2", "&max_levels=3", "&max_field_chars=16", "&max_field_chars=20",
                        "&missing=", "&missing=NA,%3F", "&missing=ok", "&missing=%2C%2C")));
        return r -> "pool=" + pool.next(r) + labelPart.next(r) + roles.next(r) + limits.next(r);
    }

    /** The head of a file for the mapping step's preview. */
    static Gen<Upload> heads() {
        return file().flatMap(f -> Gen.of("f.csv", "f.jsonl", "f.ndjson", "f", "f.json", "")
                .map(name -> new Upload("file_name=" + enc(name), f.body())));
    }

    // ---- text helpers --------------------------------------------------------------------------

    static String quote(String s) {
        StringBuilder out = new StringBuilder();
        dev.dowser.json.Json.appendString(out, s);
        return out.toString();
    }

    static String enc(String s) {
        return URLEncoder.encode(s, StandardCharsets.UTF_8).replace("+", "%20");
    }
}
