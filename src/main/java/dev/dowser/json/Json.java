package dev.dowser.json;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.StreamReadConstraints;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;

/**
 * The one JSON facade of the project: every package that reads or writes JSON goes through
 * here, so the mapper's settings (strictness, limits, date handling) are decided once.
 */
public final class Json {

    /** Longest JSON string value we accept anywhere, in characters. */
    public static final int MAX_STRING_CHARS = 10_000_000;

    private static final ObjectMapper MAPPER = new ObjectMapper(JsonFactory.builder()
            .streamReadConstraints(StreamReadConstraints.builder()
                    .maxStringLength(MAX_STRING_CHARS)
                    .maxNestingDepth(64)
                    .build())
            .build())
            .findAndRegisterModules()
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS)
            .enable(DeserializationFeature.FAIL_ON_NULL_FOR_PRIMITIVES)
            .disable(SerializationFeature.WRITE_DATES_AS_TIMESTAMPS);

    private Json() {
    }

    public static ObjectMapper mapper() {
        return MAPPER;
    }

    public static String write(Object value) {
        try {
            return MAPPER.writeValueAsString(value);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException("cannot write JSON for " + value.getClass().getSimpleName(), e);
        }
    }

    public static <T> T read(String text, Class<T> type) {
        try {
            return MAPPER.readValue(text, type);
        } catch (JsonProcessingException e) {
            throw new IllegalArgumentException("not valid JSON for " + type.getSimpleName() + ": "
                    + e.getOriginalMessage(), e);
        }
    }

    public static JsonNode tree(String text) {
        try {
            return MAPPER.readTree(text);
        } catch (JsonProcessingException e) {
            throw new IllegalArgumentException("not valid JSON: " + e.getOriginalMessage(), e);
        }
    }

    /** The value at a parser's current token (an object or array read to its end), leaving the parser after it. */
    public static JsonNode treeAt(com.fasterxml.jackson.core.JsonParser p) throws java.io.IOException {
        return MAPPER.readerFor(JsonNode.class).without(DeserializationFeature.FAIL_ON_TRAILING_TOKENS).readValue(p);
    }

    public static ObjectNode object() {
        return MAPPER.createObjectNode();
    }

    public static ArrayNode array() {
        return MAPPER.createArrayNode();
    }

    /** The whole number in {@code object}'s {@code field}, null when the field is absent; any other value is refused. */
    public static Integer wholeNumber(JsonNode object, String field) {
        JsonNode v = object.get(field);
        if (v == null) {
            return null;
        }
        if (!v.isIntegralNumber() || !v.canConvertToInt()) {
            throw new IllegalArgumentException("field '" + field + "' must be a whole number, got " + v);
        }
        return v.asInt();
    }

    /** The number in {@code object}'s {@code field}, null when the field is absent; any other value is refused. */
    public static Double number(JsonNode object, String field) {
        JsonNode v = object.get(field);
        if (v == null) {
            return null;
        }
        if (!v.isNumber()) {
            throw new IllegalArgumentException("field '" + field + "' must be a number, got " + v);
        }
        return v.asDouble();
    }

    /** The string in {@code object}'s {@code field}, null when the field is absent; any other value is refused. */
    public static String text(JsonNode object, String field) {
        JsonNode v = object.get(field);
        if (v == null) {
            return null;
        }
        if (!v.isTextual()) {
            throw new IllegalArgumentException("field '" + field + "' must be a string, got " + v);
        }
        return v.asText();
    }

    /** Appends {@code s} to {@code out} as a JSON string literal, quotes included. */
    public static void appendString(StringBuilder out, String s) {
        out.append('"');
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '"' -> out.append("\\\"");
                case '\\' -> out.append("\\\\");
                case '\n' -> out.append("\\n");
                case '\r' -> out.append("\\r");
                case '\t' -> out.append("\\t");
                default -> {
                    if (c < 0x20 || c == 0x2028 || c == 0x2029) {
                        out.append(String.format("\\u%04x", (int) c));
                    } else {
                        out.append(c);
                    }
                }
            }
        }
        out.append('"');
    }
}
