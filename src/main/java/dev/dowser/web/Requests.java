package dev.dowser.web;

import com.fasterxml.jackson.databind.JsonNode;
import dev.dowser.json.Json;
import io.undertow.server.HttpServerExchange;
import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.Deque;
import java.util.List;
import java.util.Locale;

/** Reading requests: path and query parameters, and bounded JSON bodies, each failing with a message that names the field. */
final class Requests {

    static final int MAX_JSON_BODY_BYTES = 16_384;
    /** Records per page when a call's {@code limit} is not given. */
    static final int DEFAULT_PAGE = 50;

    private Requests() {
    }

    static String param(HttpServerExchange ex, String name) {
        return ex.getQueryParameters().get(name).getFirst();
    }

    static String query(HttpServerExchange ex, String name, String fallback) {
        Deque<String> v = ex.getQueryParameters().get(name);
        return v == null || v.isEmpty() || v.getFirst().isEmpty() ? fallback : v.getFirst();
    }

    static String requiredQuery(HttpServerExchange ex, String name) {
        String v = query(ex, name, null);
        if (v == null) {
            throw new ApiException(400, "query parameter '" + name + "' is required");
        }
        return v;
    }

    static List<String> listQuery(HttpServerExchange ex, String name) {
        String v = query(ex, name, null);
        return v == null ? List.of() : Arrays.stream(v.split(",")).map(String::strip).toList();
    }

    static long longQuery(HttpServerExchange ex, String name, long fallback) {
        String v = query(ex, name, null);
        if (v == null) {
            return fallback;
        }
        try {
            return Long.parseLong(v.strip());
        } catch (NumberFormatException e) {
            throw new ApiException(400, "query parameter '" + name + "' must be a whole number, got '" + v + "'");
        }
    }

    /** A whole number from {@code min} to {@code max} in query parameter {@code name}, or {@code fallback}. */
    static int intQuery(HttpServerExchange ex, String name, int fallback, int min, int max) {
        long v = longQuery(ex, name, fallback);
        if (v < min || v > max) {
            throw new ApiException(400, "query parameter '" + name + "' must be " + min + " to " + max + ", got " + v);
        }
        return (int) v;
    }

    /**
     * The request's JSON body, a JSON object (the gate has read it, refusing it past
     * {@value #MAX_JSON_BODY_BYTES} bytes); {@code what} names it in the error.
     */
    static JsonNode jsonBody(HttpServerExchange ex, String what) {
        byte[] bytes = Bodies.of(ex);
        if (bytes.length == 0) {
            throw new ApiException(400, what + " needs a JSON object as its body; the body was empty");
        }
        JsonNode body;
        try {
            body = Json.tree(StandardCharsets.UTF_8.newDecoder().decode(ByteBuffer.wrap(bytes)).toString());
        } catch (CharacterCodingException e) {
            throw new ApiException(400, what + " must be JSON in UTF-8; its body is not UTF-8");
        } catch (IllegalArgumentException e) {
            throw new ApiException(400, what + " is " + e.getMessage());
        }
        if (body == null || !body.isObject()) {
            throw new ApiException(400, what + " needs a JSON object as its body, got "
                    + (body == null || body.isMissingNode() ? "nothing" : body.getNodeType().name().toLowerCase(Locale.ROOT)));
        }
        return body;
    }

    static String requiredText(JsonNode body, String field) {
        JsonNode v = body.get(field);
        if (v == null || !v.isTextual() || v.asText().isBlank()) {
            throw new ApiException(400, "field '" + field + "' is required and must be a non-empty string");
        }
        return v.asText();
    }

    /** An optional text field: null when absent or null. */
    static String optionalText(JsonNode body, String field) {
        JsonNode v = body.get(field);
        if (v == null || v.isNull()) {
            return null;
        }
        if (!v.isTextual()) {
            throw new ApiException(400, "field '" + field + "' must be a string");
        }
        return v.asText();
    }

    /** A required whole-number field. */
    static int requiredInt(JsonNode body, String field) {
        Integer v = Json.wholeNumber(body, field);
        if (v == null) {
            throw new ApiException(400, "field '" + field + "' is required and must be a whole number");
        }
        return v;
    }
}
