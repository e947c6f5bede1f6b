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
        exchange.setStatusCode(status);
        exchange.getResponseHeaders().put(Headers.CONTENT_TYPE, JSON);
        exchange.getResponseHeaders().put(Headers.CACHE_CONTROL, "no-store");
        exchange.getResponseSender().send(Json.write(body), StandardCharsets.UTF_8);
    }

    static void ok(HttpServerExchange exchange, Object body) {
        json(exchange, 200, body);
    }
}
