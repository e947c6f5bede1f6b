package dev.dowser.web;

import static dev.dowser.web.Gen.w;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;

/**
 * The JSON bodies of {@link EdgeFuzzTest}: every call of the API that takes one, built from the
 * API's own field names with values that fit, values of every type and hostile text, sent by an
 * admin, a labeller or nobody, to the fixture's pool or to one that is not there.
 */
final class FuzzCalls {

    private FuzzCalls() {
    }

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

    static Gen<String> apiValue() {
        return Gen.frequency(
                w(4, Gen.of("\"ok\"", "\"fault\"", "\"a1\"", "\"a2\"", "\"ana\"", "\"leo\"", "\"admin\"",
                        "\"labeller\"", "\"accept\"", "\"override\"", "\"bald\"", "\"random\"", "\"a long new password\"",
                        "\"test-password-1\"", "0", "1", "2", "10", "-1", "0.5", "1.0", "true", "false", "null")),
                w(3, FuzzInputs.jsonValue()),
                w(1, HostileText.text(4).map(FuzzInputs::quote)),
                w(1, Gen.of(HostileText.NUMBERS)));
    }

    static Gen<String> jsonBody() {
        Gen<String> object = FuzzInputs.member(Gen.of(FIELDS), apiValue()).list(0, 5).map(l -> "{" + String.join(",", l) + "}");
        return Gen.frequency(
                w(8, object),
                w(1, FuzzInputs.jsonValue()),
                w(1, Gen.of("", "{", "{\"name\":", "[", "\"", "{}}", "nul", "{\"a\":1,}",
                        "[".repeat(100) + "]".repeat(100), "{\"a\":".repeat(80) + "1" + "}".repeat(80), "\u0000{}")),
                w(1, Gen.of(HostileText.BROKEN_JSON)),
                w(1, HostileText.text(6)));
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

    /** Fields that hold what people type: a third of their values are hostile text. */
    static final java.util.Set<String> FREE_TEXT = java.util.Set.of("name", "password", "current", "note", "reason");

    /** A body for {@code call}: its own fields with fitting values, some dropped, changed or added. */
    static Gen<String> bodyFor(String call) {
        java.util.Map<String, List<String>> shape = SHAPES.get(call);
        List<String> keys = new ArrayList<>(new java.util.TreeSet<>(shape.keySet()));
        Gen<String> other = apiValue();
        Gen<String> extra = Gen.frequency(w(4, Gen.constant("")), w(1, FuzzInputs.member(Gen.of(FIELDS), apiValue())));
        Gen<String> hostile = HostileText.text(4).map(FuzzInputs::quote);
        Gen<String> fitting = r -> {
            List<String> parts = new ArrayList<>();
            for (String key : keys) {
                List<String> values = shape.get(key);
                int how = r.nextInt(10);
                if (how == 0) {
                    continue; // dropped
                }
                String value = how == 1 ? other.next(r)
                        : how <= 4 && FREE_TEXT.contains(key) ? hostile.next(r)
                        : values.get(r.nextInt(values.size()));
                parts.add(FuzzInputs.quote(key) + ":" + value);
            }
            String e = extra.next(r);
            if (!e.isEmpty()) {
                parts.add(e);
            }
            return "{" + String.join(",", parts) + "}";
        };
        return Gen.frequency(w(7, fitting), w(3, jsonBody()));
    }

    static Gen<FuzzInputs.Call> calls() {
        Gen<String> name = Gen.frequency(w(4, Gen.of("leo", "cleo")),
                w(1, Gen.of("ana", "nobody", "a b", "Ünï", "..", "x".repeat(200))), w(1, HostileText.token()));
        Gen<String> pool = Gen.frequency(w(8, Gen.constant("p")), w(1, Gen.of("nope", "..", "a b", "%2F", "Ünï")),
                w(1, HostileText.token()));
        Gen<String> caller = Gen.frequency(w(6, Gen.constant("admin")), w(3, Gen.constant("labeller")),
                w(1, Gen.constant("nobody")));
        return Gen.of(JSON_CALLS).flatMap(call -> {
            Gen<String> body = bodyFor(call);
            return r -> {
                String n = name.next(r);
                String p = pool.next(r);
                String b = body.next(r);
                String[] mp = call.split(" ");
                String path = mp[1].replace("{name}", FuzzInputs.enc(n)).replace("{pool}", FuzzInputs.enc(p));
                return new FuzzInputs.Call(caller.next(r), mp[0], path, b.getBytes(StandardCharsets.UTF_8));
            };
        });
    }
}
