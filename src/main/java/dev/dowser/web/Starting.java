package dev.dowser.web;

import io.undertow.server.HttpHandler;
import io.undertow.server.HttpServerExchange;
import io.undertow.util.Headers;

/**
 * The front of the server while it starts: every request is answered 503 with a message until the
 * gate is ready, then passed to it.
 */
final class Starting implements HttpHandler {

    static final int RETRY_AFTER_SECONDS = 2;

    private volatile HttpHandler gate;

    void open(HttpHandler ready) {
        this.gate = ready;
    }

    @Override
    public void handleRequest(HttpServerExchange ex) throws Exception {
        HttpHandler g = gate;
        if (g != null) {
            g.handleRequest(ex);
            return;
        }
        Gate.secureHeaders(ex.getResponseHeaders());
        ex.getResponseHeaders().put(Headers.RETRY_AFTER, RETRY_AFTER_SECONDS);
        Errors.send(ex, new ApiException(503, "Dowser is starting; try again in a few seconds"));
    }
}
