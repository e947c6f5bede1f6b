package dev.dowser.web;

import dev.dowser.json.Json;
import io.undertow.server.HttpServerExchange;
import io.undertow.util.Headers;
import java.nio.charset.StandardCharsets;

/** Writes responses. */
final class Responses {

    static final String JSON = "application/json; charset=utf-8";

    private Responses() {
    }

    static void json(HttpServerExchange exchange, int status, Object body) {
        jsonText(exchange, status, Json.write(body));
    }

    /** Sends JSON already written as text. */
    static void jsonText(HttpServerExchange exchange, int status, String json) {
        jsonHeaders(exchange, status);
        exchange.getResponseSender().send(json, StandardCharsets.UTF_8);
    }

    /** The status and headers of a JSON answer, for a caller that writes the body itself. */
    static void jsonHeaders(HttpServerExchange exchange, int status) {
        exchange.setStatusCode(status);
        exchange.getResponseHeaders().put(Headers.CONTENT_TYPE, JSON);
        exchange.getResponseHeaders().put(Headers.CACHE_CONTROL, "no-store");
    }

    static void ok(HttpServerExchange exchange, Object body) {
        json(exchange, 200, body);
    }
}
