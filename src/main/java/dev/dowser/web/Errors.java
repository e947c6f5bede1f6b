package dev.dowser.web;

import dev.dowser.data.ImportException;
import dev.dowser.json.Json;
import dev.dowser.store.BusyException;
import dev.dowser.store.ConflictException;
import dev.dowser.store.NotFoundException;
import dev.dowser.team.AuthException;
import io.undertow.server.HttpServerExchange;
import io.undertow.util.Headers;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/** The one mapping from exceptions to error responses: {"error": message} with a fitting status. */
final class Errors {

    private static final Logger LOG = LoggerFactory.getLogger(Errors.class);

    private Errors() {
    }

    static void send(HttpServerExchange exchange, Throwable e) {
        if (e instanceof ClientGone gone) {
            Bodies.abandoned(exchange, gone.received(), gone.getMessage());
            return;
        }
        int status;
        String message;
        if (e instanceof AuthException auth) {
            status = switch (auth.kind()) {
                case NOT_SIGNED_IN -> 401;
                case FORBIDDEN -> 403;
                case HELD_BACK -> 429;
            };
            message = auth.getMessage();
            if (auth.retryAfterSeconds() > 0) {
                exchange.getResponseHeaders().put(Headers.RETRY_AFTER, auth.retryAfterSeconds());
            }
        } else if (e instanceof ApiException api) {
            status = api.status();
            message = api.getMessage();
        } else if (e instanceof BusyException) {
            // One line, no stack: not a fault, but how often the database made people wait is worth seeing.
            LOG.warn("request {} {} answered busy: {}", exchange.getRequestMethod(), exchange.getRequestPath(),
                    e.getMessage());
            status = 503;
            message = e.getMessage();
            exchange.getResponseHeaders().put(Headers.RETRY_AFTER, BusyException.RETRY_AFTER_SECONDS);
        } else if (e instanceof NotFoundException) {
            status = 404;
            message = e.getMessage();
        } else if (e instanceof ConflictException) {
            status = 409;
            message = e.getMessage();
        } else if (e instanceof ImportException || e instanceof IllegalArgumentException) {
            status = 400;
            message = e.getMessage();
        } else {
            LOG.error("request {} {} failed", exchange.getRequestMethod(), exchange.getRequestPath(), e);
            status = 500;
            message = "the server failed to handle this request; the log has the details";
        }
        if (exchange.isResponseStarted()) {
            exchange.endExchange();
            return;
        }
        var body = Json.object().put("error", message);
        if (!exchange.isRequestComplete()) {
            // The rest of the body is not wanted, but the client may still be sending it: answer, then close in stages.
            LingeringClose.send(exchange, status, Json.write(body));
            return;
        }
        Responses.json(exchange, status, body);
    }
}
