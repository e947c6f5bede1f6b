package dev.dowser.web;

import java.net.URLEncoder;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.Combinators;
import net.jqwik.api.Tuple;

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
        @Override
        public String toString() {
            return "query " + query + ", body (" + body.length + " bytes):\n"
                    + new String(body, 0, Math.min(body.length, 2_000), StandardCharsets.UTF_8);
        }
    }

    /** One API call with a JSON body (or something that should be one). */
    record Call(String caller, String method, String path, byte[] body) {
        @Override
        public String toString() {
            return caller + " " + method + " " + path + " " + new String(body, StandardCharsets.UTF_8);
        }
    }

    // ---- files ---------------------------------------------------------------------------------

    /** Column names: plain, repeated, empty, quoted, numeric-looking, long, non-ASCII. */
    static Arbitrary<String> columnName() {
        return Arbitraries.frequencyOf(
                Tuple.of(6, Arbitraries.of("id", "flow", "site", "label", "trace", "note", "x", "y", "class")),
                Tuple.of(2, Arbitraries.of("", " ", "\"a,b\"", "\"q\"\"q\"", "1", "2.5", "Ünï", "名前", "a\tb", "id ")),
                Tuple.of(1, Arbitraries.strings().ofMinLength(1).ofMaxLength(300).withCharRange(' ', '~')));
    }

    /** Field values: numbers of every spelling, missing tokens, JSON arrays, quotes, breaks, control characters. */
    static Arbitrary<String> field() {
        return Arbitraries.frequencyOf(
                Tuple.of(6, Arbitraries.doubles().between(-1e6, 1e6).map(d -> Double.toString(d))),
                Tuple.of(3, Arbitraries.of("ok", "fault", "north", "south", "a", "b", "c")),
                Tuple.of(3, Arbitraries.of("", "NaN", "inf", "-Infinity", "1e999", "-0", "0x1F", "1,5", "?", "NA",
                        "null", "true", "[1,2,3]", "[1,", "[]", "[[1]]", "[\"a\"]", "{\"a\":1}", "\"", "a\"b",
                        "two\nlines", "x,y", "=cmd|' /C calc'!A0", "\u0000", "\u001b[31m",
                        "\uFEFF", "\uD83D\uDE00", "\r", "9".repeat(400))),
                Tuple.of(1, Arbitraries.strings().ofMaxLength(200)));
    }

    /** What a column holds: numbers (some missing), words, arrays of numbers of one length, or anything at all. */
    enum Kind { NUMBER, WORD, EMBEDDING, ANYTHING }

    /** A value of a column of {@code kind}; embeddings have {@code width} numbers. */
    static Arbitrary<String> value(Kind kind, int width) {
        return switch (kind) {
            case NUMBER -> Arbitraries.frequencyOf(
                    Tuple.of(12, Arbitraries.doubles().between(-1e6, 1e6).ofScale(3).map(d -> Double.toString(d))),
                    Tuple.of(2, Arbitraries.integers().between(-1000, 1000).map(i -> Integer.toString(i))),
                    Tuple.of(1, Arbitraries.of("", "NA", "?", "1e5", "-0", ".5", "NaN", "1e999")));
            case WORD -> Arbitraries.frequencyOf(
                    Tuple.of(10, Arbitraries.of("north", "south", "east", "west", "pump a", "Ünïcödé ✓", "名前")),
                    Tuple.of(2, Arbitraries.of("", "say \"hi\"", "a, b", "two\nlines", "=SUM(A1)", " padded ")),
                    Tuple.of(1, Arbitraries.strings().ofMinLength(1).ofMaxLength(40)));
            case EMBEDDING -> Arbitraries.frequencyOf(
                    Tuple.of(12, Arbitraries.doubles().between(-5, 5).ofScale(2).list().ofSize(width)
                            .map(l -> "[" + String.join(",", l.stream().map(d -> Double.toString(d)).toList()) + "]")),
                    Tuple.of(1, Arbitraries.of("[]", "[1,", "[\"a\"]", "[[1]]", "", "[1e999]")));
            case ANYTHING -> field();
        };
    }

    /** A table: distinct column names, a kind per column, 1 to 12 rows, perhaps a label column. */
    record Table(List<String> names, List<List<String>> rows, boolean hasLabel) {
    }

    static Arbitrary<Table> table() {
        Arbitrary<List<String>> names = Arbitraries.frequencyOf(
                Tuple.of(10, Arbitraries.of("flow", "site", "trace", "note", "speed_mm_s", "grade", "when", "x")
                        .list().uniqueElements().ofMinSize(1).ofMaxSize(6)),
                Tuple.of(1, columnName().list().ofMinSize(1).ofMaxSize(6)));
        Arbitrary<Kind> kind = Arbitraries.frequency(Tuple.of(6, Kind.NUMBER), Tuple.of(3, Kind.WORD),
                Tuple.of(1, Kind.EMBEDDING), Tuple.of(1, Kind.ANYTHING));
        return Combinators.combine(names, Arbitraries.of(true, false), Arbitraries.integers().between(1, 12))
                .flatAs((cols, label, n) -> kind.list().ofSize(cols.size()).flatMap(kinds ->
                        Arbitraries.integers().between(1, 4).list().ofSize(cols.size()).flatMap(widths -> {
                            List<Arbitrary<String>> perColumn = new ArrayList<>();
                            for (int c = 0; c < cols.size(); c++) {
                                perColumn.add(value(kinds.get(c), widths.get(c)));
                            }
                            if (label) {
                                perColumn.add(Arbitraries.frequencyOf(Tuple.of(5, Arbitraries.of("ok", "fault")),
                                        Tuple.of(2, Arbitraries.just("")), Tuple.of(1, Arbitraries.of("maybe", " ok "))));
                            }
                            List<String> header = new ArrayList<>(cols);
                            if (label) {
                                header.add("label");
                            }
                            Arbitrary<List<String>> row = Combinators.combine(perColumn).as(List::copyOf);
                            return row.list().ofSize(n).map(rows -> new Table(header, rows, label));
                        })));
    }

    /**
     * A CSV file of a {@link #table()}, with any line ends and perhaps a byte order mark. Most are
     * written as a careful program would (fields quoted where RFC 4180 needs it); the rest join the
     * raw values, as a careless one would, and a few rows may be short or long.
     */
    static Arbitrary<String> csv() {
        return table().flatMap(FuzzInputs::csv);
    }

    static Arbitrary<String> csv(Table table) {
        return Combinators.combine(Arbitraries.just(table), Arbitraries.of("\n", "\r\n", "\r"), Arbitraries.of("", "\uFEFF"),
                        Arbitraries.frequency(Tuple.of(1, -1), Tuple.of(20, 0), Tuple.of(1, 1)),
                        Arbitraries.frequency(Tuple.of(15, true), Tuple.of(1, false)))
                .as((t, end, bom, ragged, careful) -> {
                    StringBuilder s = new StringBuilder(bom).append(row(t.names(), careful)).append(end);
                    for (List<String> row : t.rows()) {
                        List<String> r = new ArrayList<>(row);
                        if (ragged < 0 && !r.isEmpty()) {
                            r.remove(r.size() - 1);
                        } else if (ragged > 0) {
                            r.add("extra");
                        }
                        s.append(row(r, careful)).append(end);
                    }
                    return s.toString();
                });
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
    static Arbitrary<String> jsonLinesOfTable() {
        return table().flatMap(FuzzInputs::jsonLines);
    }

    static Arbitrary<String> jsonLines(Table table) {
        return Combinators.combine(Arbitraries.just(table), Arbitraries.frequency(Tuple.of(15, true), Tuple.of(1, false)))
                .as((t, clean) -> {
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
                });
    }

    /** A JSON value as text, nested a little. */
    static Arbitrary<String> jsonValue() {
        Arbitrary<String> leaf = Arbitraries.frequencyOf(
                Tuple.of(4, Arbitraries.doubles().between(-1e9, 1e9).map(d -> Double.toString(d))),
                Tuple.of(3, Arbitraries.integers().map(i -> Integer.toString(i))),
                Tuple.of(3, field().map(FuzzInputs::quote)),
                Tuple.of(2, Arbitraries.of("null", "true", "false", "1e999", "-1e999", "123456789012345678901234567890",
                        "0.1e-400", "\"\\ud800\"", "\"\\u0000\"", "-0")));
        return Arbitraries.lazyOf(
                () -> leaf,
                () -> leaf,
                () -> leaf,
                () -> jsonValue().list().ofMaxSize(4).map(l -> "[" + String.join(",", l) + "]"),
                () -> Combinators.combine(columnName(), jsonValue()).as((k, v) -> quote(k) + ":" + v)
                        .list().ofMaxSize(4).map(l -> "{" + String.join(",", l) + "}"));
    }

    /** A JSON Lines file: objects over a few keys, some lines broken. */
    static Arbitrary<String> jsonLines() {
        Arbitrary<String> line = Arbitraries.frequencyOf(
                Tuple.of(8, Combinators.combine(columnName(), jsonValue()).as((k, v) -> quote(k) + ":" + v)
                        .list().ofMinSize(1).ofMaxSize(6).map(l -> "{" + String.join(",", l) + "}")),
                Tuple.of(1, jsonValue()),
                Tuple.of(1, Arbitraries.of("", "{", "}", "{\"a\":", "not json", "{\"a\":1}{\"b\":2}", "\uFEFF{}")));
        return line.list().ofMinSize(0).ofMaxSize(10).map(l -> String.join("\n", l) + "\n");
    }

    /** Bytes changed the ways files get damaged: cut, spliced, overwritten, sprayed with non-UTF-8. */
    static Arbitrary<byte[]> damaged(Arbitrary<String> text) {
        return Combinators.combine(text, Arbitraries.integers().between(0, 15), Arbitraries.longs())
                .as((t, how, seed) -> {
                    byte[] b = t.getBytes(StandardCharsets.UTF_8);
                    java.util.SplittableRandom rng = new java.util.SplittableRandom(seed);
                    return switch (how) {
                        case 1 -> java.util.Arrays.copyOf(b, b.length == 0 ? 0 : rng.nextInt(b.length));
                        case 2 -> {
                            for (int k = 0; k < 3 && b.length > 0; k++) {
                                b[rng.nextInt(b.length)] = (byte) rng.nextInt(256);
                            }
                            yield b;
                        }
                        case 3 -> splice(b, rng, new byte[] {(byte) 0xC3, (byte) 0x28, (byte) 0xFF, (byte) 0xFE});
                        case 4 -> splice(b, rng, "\",\"\n\"".getBytes(StandardCharsets.UTF_8));
                        default -> b;
                    };
                });
    }

    private static byte[] splice(byte[] b, java.util.SplittableRandom rng, byte[] add) {
        int at = b.length == 0 ? 0 : rng.nextInt(b.length + 1);
        byte[] out = new byte[b.length + add.length];
        System.arraycopy(b, 0, out, 0, at);
        System.arraycopy(add, 0, out, at, add.length);
        System.arraycopy(b, at, out, at + add.length, b.length - at);
        return out;
    }

    /** The body of an upload: a CSV or JSON Lines file, now and then damaged, or noise. */
    static Arbitrary<Tuple.Tuple2<String, byte[]>> file() {
        return Arbitraries.frequencyOf(
                Tuple.of(6, damaged(csv()).map(b -> Tuple.of("csv", b))),
                Tuple.of(3, damaged(jsonLinesOfTable()).map(b -> Tuple.of("jsonl", b))),
                Tuple.of(1, damaged(jsonLines()).map(b -> Tuple.of("jsonl", b))),
                Tuple.of(1, Arbitraries.bytes().array(byte[].class).ofMaxSize(600).map(b -> Tuple.of("bin", b))));
    }

    /** Upload parameters: a pool name, a file name, and column roles taken from names that may or may not be there. */
    static Arbitrary<String> importQuery(String kind) {
        Arbitrary<String> names = Arbitraries.frequencyOf(Tuple.of(3, Arbitraries.just("")),
                Tuple.of(1, columnName().list().ofMaxSize(4).map(l -> String.join(",", l))));
        Arbitrary<String> pool = Arbitraries.frequencyOf(
                Tuple.of(12, Arbitraries.strings().withCharRange('a', 'z').ofMinLength(1).ofMaxLength(12)),
                Tuple.of(1, Arbitraries.of("", "p", "../x", "a b", "Ünï", "x".repeat(300), "con", "%00")));
        Arbitrary<String> number = Arbitraries.frequencyOf(Tuple.of(8, Arbitraries.just("")),
                Tuple.of(1, Arbitraries.of("0", "1", "2", "16", "50", "-5", "99999999999", "x", "1.5")));
        Arbitrary<String> classes = Arbitraries.frequencyOf(Tuple.of(6, Arbitraries.of("ok,fault", "a,b,c")),
                Tuple.of(2, Arbitraries.just("")), Tuple.of(1, Arbitraries.of("a,a", " ", "x".repeat(250), ",,")));
        return Combinators.combine(pool, Arbitraries.of(kind, kind, kind, "csv", "jsonl", "json", "txt", ""), names,
                        names, classes, names, number, number)
                .as((p, ext, features, display, cls, categorical, levels, chars) -> {
                    StringBuilder q = new StringBuilder("pool=").append(enc(p)).append("&file_name=f.").append(enc(ext));
                    q.append("&features=").append(enc(features)).append("&display=").append(enc(display));
                    q.append("&classes=").append(enc(cls)).append("&categorical=").append(enc(categorical));
                    q.append("&max_levels=").append(enc(levels)).append("&max_field_chars=").append(enc(chars));
                    return q.toString();
                })
                .flatMap(q -> Combinators.combine(
                        Arbitraries.frequencyOf(Tuple.of(6, Arbitraries.just("")),
                                Tuple.of(1, Arbitraries.of("id", "flow", "nope", "label", "x"))),
                        Arbitraries.frequencyOf(Tuple.of(3, Arbitraries.just("")), Tuple.of(4, Arbitraries.just("label")),
                                Tuple.of(1, Arbitraries.of("class", "id", "nope", "y")))).as((id, label) ->
                        q + (id.isEmpty() ? "" : "&id=" + id) + (label.isEmpty() ? "" : "&label=" + label)));
    }

    /**
     * Uploads: mostly a table written as CSV or JSON Lines with parameters that fit it (the label
     * column named when there is one, else the classes; now and then a choice of features), so that
     * many imports succeed and the checks past the first are reached; the rest anything at all.
     */
    static Arbitrary<Upload> uploads() {
        return Arbitraries.frequencyOf(
                Tuple.of(7, table().flatMap(t -> Combinators.combine(
                        Arbitraries.frequencyOf(Tuple.of(2, damaged(csv(t)).map(b -> Tuple.of("csv", b))),
                                Tuple.of(1, damaged(jsonLines(t)).map(b -> Tuple.of("jsonl", b)))),
                        fittingQuery(t)).as((f, q) -> new Upload("file_name=f." + f.get1() + "&" + q, f.get2())))),
                Tuple.of(3, file().flatMap(f -> importQuery(f.get1()).map(q -> new Upload(q, f.get2())))));
    }

    /** Parameters that fit the table, but for a slip now and then. */
    static Arbitrary<String> fittingQuery(Table t) {
        List<String> columns = t.names().stream().filter(n -> !n.equals("label")).toList();
        Arbitrary<String> pool = Arbitraries.strings().withCharRange('a', 'z').ofMinLength(1).ofMaxLength(12);
        Arbitrary<String> labelPart = t.hasLabel()
                ? Arbitraries.frequencyOf(Tuple.of(8, Arbitraries.just("&label=label")),
                        Tuple.of(1, Arbitraries.just("&label=label&classes=ok,fault")),
                        Tuple.of(1, Arbitraries.just("&classes=ok,fault")))
                : Arbitraries.frequencyOf(Tuple.of(9, Arbitraries.of("&classes=ok,fault", "&classes=a,b,c")),
                        Tuple.of(1, Arbitraries.just("&label=label")));
        Arbitrary<String> subset = Arbitraries.subsetOf(columns).map(sub -> String.join(",", sub));
        // A table may hold nothing but its label column: then a column to name is one it lacks.
        Arbitrary<String> column = columns.isEmpty() ? Arbitraries.just("nope") : Arbitraries.of(columns);
        Arbitrary<String> roles = Arbitraries.frequencyOf(Tuple.of(6, Arbitraries.just("")),
                Tuple.of(1, subset.map(f -> "&features=" + enc(f))),
                Tuple.of(1, subset.map(f -> "&display=" + enc(f))),
                Tuple.of(1, column.map(c -> "&features=" + enc(c) + "&categorical=" + enc(c))),
                Tuple.of(1, column.map(c -> "&id=" + enc(c))));
        Arbitrary<String> limits = Arbitraries.frequencyOf(Tuple.of(9, Arbitraries.just("")),
                Tuple.of(1, Arbitraries.of("&max_levels=2", "&max_levels=3", "&max_field_chars=16", "&max_field_chars=20",
                        "&missing=", "&missing=NA,%3F", "&missing=ok", "&missing=%2C%2C")));
        return Combinators.combine(pool, labelPart, roles, limits).as((p, l, r, lim) -> "pool=" + p + l + r + lim);
    }

    /** The head of a file for the mapping step's preview. */
    static Arbitrary<Upload> heads() {
        return file().flatMap(f -> Arbitraries.of("f.csv", "f.jsonl", "f.ndjson", "f", "f.json", "")
                .map(name -> new Upload("file_name=" + enc(name), f.get2())));
    }

    // ---- JSON bodies -----------------------------------------------------------------------------

    /** Every call that takes a JSON body, with the pool p of the fixture or a name that is not there. */
    static final List<String> JSON_CALLS = List.of(
            "POST /api/v1/session", "PUT /api/v1/session/password", "POST /api/v1/tokens", "POST /api/v1/users",
            "PUT /api/v1/users/{name}", "POST /api/v1/pools/{pool}/queue/next", "POST /api/v1/pools/{pool}/queue/skip",
            "POST /api/v1/pools/{pool}/labels", "POST /api/v1/pools/{pool}/labels/undo",
            "POST /api/v1/pools/{pool}/reviews", "PUT /api/v1/pools/{pool}/settings");
    /** The field names the API reads, so that generated objects get past the first check. */
    static final List<String> FIELDS = List.of("name", "password", "current", "record", "label", "note", "round",
            "position", "verdict", "reason", "role", "disabled", "batch_size", "spot_check_share",
            "double_label_share", "lease_minutes", "strategy", "cold_start", "temperature");

    static Arbitrary<String> apiValue() {
        return Arbitraries.frequencyOf(
                Tuple.of(4, Arbitraries.of("\"ok\"", "\"fault\"", "\"a1\"", "\"a2\"", "\"ana\"", "\"leo\"", "\"admin\"",
                        "\"labeller\"", "\"accept\"", "\"override\"", "\"bald\"", "\"random\"", "\"a long new password\"",
                        "\"test-password-1\"", "0", "1", "2", "10", "-1", "0.5", "1.0", "true", "false", "null")),
                Tuple.of(3, jsonValue()));
    }

    static Arbitrary<String> jsonBody() {
        Arbitrary<String> object = Combinators.combine(Arbitraries.of(FIELDS), apiValue())
                .as((k, v) -> quote(k) + ":" + v).list().ofMaxSize(5).map(l -> "{" + String.join(",", l) + "}");
        return Arbitraries.frequencyOf(
                Tuple.of(8, object),
                Tuple.of(1, jsonValue()),
                Tuple.of(1, Arbitraries.of("", "{", "{\"name\":", "[", "\"", "{}}", "nul", "{\"a\":1,}",
                        "[".repeat(100) + "]".repeat(100), "{\"a\":".repeat(80) + "1" + "}".repeat(80), "\u0000{}")));
    }

    /** What each call reads, each field with values that fit it, so that most bodies get past the first checks. */
    static final java.util.Map<String, java.util.Map<String, List<String>>> SHAPES = java.util.Map.ofEntries(
            java.util.Map.entry("POST /api/v1/session", java.util.Map.of("name", List.of("\"ana\"", "\"leo\"", "\"nobody\""),
                    "password", List.of("\"test-password-1\"", "\"wrong one!\""))),
            java.util.Map.entry("PUT /api/v1/session/password", java.util.Map.of(
                    "current", List.of("\"test-password-1\"", "\"wrong one!\""),
                    "password", List.of("\"a long new password\"", "\"short\""))),
            java.util.Map.entry("POST /api/v1/tokens", java.util.Map.of("name", List.of("\"script\"", "\"\"", "\"" + "x".repeat(120) + "\""))),
            java.util.Map.entry("POST /api/v1/users", java.util.Map.of("name", List.of("\"cleo\"", "\"ana\"", "\" x\"", "\"<b>\""),
                    "role", List.of("\"labeller\"", "\"admin\"", "\"boss\""),
                    "password", List.of("\"a long first password\"", "\"short\""))),
            java.util.Map.entry("PUT /api/v1/users/{name}", java.util.Map.of("role", List.of("\"reviewer\"", "\"boss\""),
                    "disabled", List.of("true", "false", "\"yes\""), "password", List.of("\"a long new password\"", "\"x\""))),
            java.util.Map.entry("POST /api/v1/pools/{pool}/queue/next", java.util.Map.of()),
            java.util.Map.entry("POST /api/v1/pools/{pool}/queue/skip", java.util.Map.of("round", List.of("1", "0", "-1", "99"),
                    "position", List.of("0", "1", "-1", "99999"))),
            java.util.Map.entry("POST /api/v1/pools/{pool}/labels", java.util.Map.of("record", List.of("\"a1\"", "\"a2\"", "\"zz\""),
                    "label", List.of("\"ok\"", "\"fault\"", "\"maybe\""), "note", List.of("\"seen\"", "null", "\"\""))),
            java.util.Map.entry("POST /api/v1/pools/{pool}/labels/undo", java.util.Map.of("record", List.of("\"a1\"", "\"a2\"", "\"zz\""))),
            java.util.Map.entry("POST /api/v1/pools/{pool}/reviews", java.util.Map.of("record", List.of("\"a1\"", "\"a2\"", "\"zz\""),
                    "verdict", List.of("\"accept\"", "\"override\"", "\"maybe\""), "label", List.of("\"ok\"", "\"fault\"", "\"x\""),
                    "reason", List.of("\"looked again\"", "\"\""))),
            java.util.Map.entry("PUT /api/v1/pools/{pool}/settings", java.util.Map.of("batch_size", List.of("10", "0", "100000"),
                    "spot_check_share", List.of("0.1", "1.5", "-0.1"), "double_label_share", List.of("0.2", "2"),
                    "lease_minutes", List.of("10", "0", "100000"), "strategy", List.of("\"bald\"", "\"random\"", "\"best\""),
                    "cold_start", List.of("\"kmeans++\"", "\"typiclust\"", "\"middle\""),
                    "temperature", List.of("0.1", "1", "0", "\"warm\""))));

    /** A body for {@code call}: its own fields with fitting values, some dropped, changed or added. */
    static Arbitrary<String> bodyFor(String call) {
        java.util.Map<String, List<String>> shape = SHAPES.get(call);
        List<String> keys = new ArrayList<>(new java.util.TreeSet<>(shape.keySet()));
        Arbitrary<String> fitting = Arbitraries.integers().between(0, 1 << 20).list().ofSize(keys.size())
                .flatMap(picks -> Combinators.combine(
                        Arbitraries.integers().between(0, 9).list().ofSize(keys.size()),
                        apiValue().list().ofSize(keys.size()),
                        Arbitraries.frequencyOf(Tuple.of(4, Arbitraries.just("")), Tuple.of(1, Combinators.combine(
                                Arbitraries.of(FIELDS), apiValue()).as((k, v) -> quote(k) + ":" + v))))
                        .as((how, other, extra) -> {
                            List<String> parts = new ArrayList<>();
                            for (int i = 0; i < keys.size(); i++) {
                                List<String> values = shape.get(keys.get(i));
                                if (how.get(i) == 0) {
                                    continue; // dropped
                                }
                                String v = how.get(i) == 1 ? other.get(i) : values.get(picks.get(i) % values.size());
                                parts.add(quote(keys.get(i)) + ":" + v);
                            }
                            if (!extra.isEmpty()) {
                                parts.add(extra);
                            }
                            return "{" + String.join(",", parts) + "}";
                        }));
        return Arbitraries.frequencyOf(Tuple.of(7, fitting), Tuple.of(3, jsonBody()));
    }

    static Arbitrary<Call> calls() {
        Arbitrary<String> name = Arbitraries.frequencyOf(Tuple.of(4, Arbitraries.of("leo", "cleo")),
                Tuple.of(1, Arbitraries.of("ana", "nobody", "a b", "Ünï", "..", "x".repeat(200))));
        Arbitrary<String> pool = Arbitraries.frequencyOf(Tuple.of(8, Arbitraries.just("p")),
                Tuple.of(1, Arbitraries.of("nope", "..", "a b", "%2F", "Ünï")));
        Arbitrary<String> caller = Arbitraries.frequencyOf(Tuple.of(6, Arbitraries.just("admin")),
                Tuple.of(3, Arbitraries.just("labeller")), Tuple.of(1, Arbitraries.just("nobody")));
        return Arbitraries.of(JSON_CALLS).flatMap(call -> Combinators.combine(name, pool, bodyFor(call), caller)
                .as((n, p, body, who) -> {
                    String[] mp = call.split(" ");
                    String path = mp[1].replace("{name}", enc(n)).replace("{pool}", enc(p));
                    return new Call(who, mp[0], path, body.getBytes(StandardCharsets.UTF_8));
                }));
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
