package dev.dowser.web;

import static dev.dowser.web.Requests.jsonBody;
import static dev.dowser.web.Requests.param;
import static dev.dowser.web.Requests.requiredText;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.json.Json;
import dev.dowser.store.TokenRow;
import dev.dowser.store.UserRow;
import dev.dowser.team.Accounts;
import dev.dowser.team.Caller;
import dev.dowser.team.Role;
import io.undertow.server.HttpServerExchange;
import io.undertow.server.handlers.CookieImpl;
import java.io.IOException;
import java.net.InetSocketAddress;

/** Signing in and out, API tokens, and accounts (admins only, as {@link Routes} says). */
final class TeamApi {

    private final Accounts accounts;

    TeamApi(Accounts accounts) {
        this.accounts = accounts;
    }

    void login(HttpServerExchange ex) throws IOException {
        JsonNode body = jsonBody(ex, "a sign-in");
        Accounts.SignIn in = accounts.login(requiredText(body, "name"), requiredText(body, "password"), address(ex));
        ex.setResponseCookie(new CookieImpl(Gate.SESSION_COOKIE, in.token()).setPath("/").setHttpOnly(true)
                .setSameSiteMode("Strict").setSecure("https".equals(ex.getRequestScheme())));
        Responses.ok(ex, callerJson(in.caller()));
    }

    void session(HttpServerExchange ex) {
        Responses.ok(ex, callerJson(Gate.caller(ex, true)));
    }

    void logout(HttpServerExchange ex) {
        accounts.logout(Gate.caller(ex, true));
        ex.setResponseCookie(new CookieImpl(Gate.SESSION_COOKIE, "").setPath("/").setHttpOnly(true)
                .setSameSiteMode("Strict").setMaxAge(0));
        Responses.ok(ex, Json.object().put("signed_out", true));
    }

    /** Body {"current": ..., "password": ...}: the signed-in person's new password. */
    void changeOwnPassword(HttpServerExchange ex) throws IOException {
        JsonNode body = jsonBody(ex, "a password change");
        accounts.changeOwnPassword(Gate.caller(ex, true), requiredText(body, "current"), requiredText(body, "password"),
                address(ex));
        Responses.ok(ex, Json.object().put("changed", true)
                .put("message", "password changed; your other sessions have ended"));
    }

    private static String address(HttpServerExchange ex) {
        return ((InetSocketAddress) ex.getSourceAddress()).getAddress().getHostAddress();
    }

    /** The caller's live tokens. */
    void tokens(HttpServerExchange ex) {
        Responses.ok(ex, Json.object().set("tokens", tokensJson(accounts.tokens(Gate.caller(ex, true)))));
    }

    /** An account's live tokens, for an admin. */
    void tokensOf(HttpServerExchange ex) {
        Responses.ok(ex, Json.object().put("name", param(ex, "name"))
                .set("tokens", tokensJson(accounts.tokensOf(param(ex, "name")))));
    }

    private static ArrayNode tokensJson(java.util.List<TokenRow> tokens) {
        ArrayNode list = Json.array();
        for (TokenRow t : tokens) {
            list.addObject().put("id", t.id()).put("name", t.name()).put("created_at", t.createdAt().toString());
        }
        return list;
    }

    void newToken(HttpServerExchange ex) throws IOException {
        JsonNode body = jsonBody(ex, "a token request");
        String token = accounts.newToken(Gate.caller(ex, true), requiredText(body, "name"));
        Responses.json(ex, 201, Json.object().put("token", token)
                .put("message", "this token is shown only now; keep it as you would a password"));
    }

    void revokeToken(HttpServerExchange ex) {
        long id = tokenId(ex);
        if (!accounts.revokeToken(Gate.caller(ex, true), id)) {
            throw new ApiException(404, "you have no live token with id " + id);
        }
        Responses.ok(ex, Json.object().put("revoked", id));
    }

    /** An admin revokes any account's token. */
    void revokeTokenOf(HttpServerExchange ex) {
        long id = tokenId(ex);
        String name = param(ex, "name");
        if (!accounts.revokeTokenOf(name, id, Gate.caller(ex, true).name())) {
            throw new ApiException(404, "the account '" + name + "' has no live token with id " + id);
        }
        Responses.ok(ex, Json.object().put("revoked", id).put("name", name));
    }

    private static long tokenId(HttpServerExchange ex) {
        try {
            return Long.parseLong(param(ex, "id"));
        } catch (NumberFormatException e) {
            throw new ApiException(400, "a token id is a whole number, got '" + param(ex, "id") + "'");
        }
    }

    void users(HttpServerExchange ex) {
        ArrayNode list = Json.array();
        java.util.Map<String, Long> live = accounts.liveTokenCounts();
        accounts.list().forEach(u -> list.add(userJson(u).put("live_tokens", live.getOrDefault(u.name(), 0L))));
        Responses.ok(ex, Json.object().set("users", list));
    }

    void addUser(HttpServerExchange ex) throws IOException {
        JsonNode body = jsonBody(ex, "a new account");
        UserRow u = accounts.add(requiredText(body, "name"), Role.parse(requiredText(body, "role")),
                requiredText(body, "password"), Gate.caller(ex, true).name());
        Responses.json(ex, 201, userJson(u));
    }

    /** Changes any of role, disabled and password of an account. */
    void changeUser(HttpServerExchange ex) throws IOException {
        JsonNode body = jsonBody(ex, "an account change");
        body.fieldNames().forEachRemaining(f -> {
            if (!f.equals("role") && !f.equals("disabled") && !f.equals("password")) {
                throw new ApiException(400, "unknown field '" + f + "': an account change may set role, disabled"
                        + " or password");
            }
        });
        if (body.has("disabled") && !body.get("disabled").isBoolean()) {
            throw new ApiException(400, "field 'disabled' must be true or false");
        }
        UserRow changed = accounts.change(param(ex, "name"),
                body.has("role") ? Role.parse(requiredText(body, "role")) : null,
                body.has("disabled") ? body.get("disabled").asBoolean() : null,
                body.has("password") ? requiredText(body, "password") : null, Gate.caller(ex, true).name());
        Responses.ok(ex, userJson(changed));
    }

    private static ObjectNode callerJson(Caller c) {
        return Json.object().put("name", c.name()).put("role", c.role().word()).put("csrf", c.csrfToken());
    }

    private static ObjectNode userJson(UserRow u) {
        return Json.object().put("name", u.name()).put("role", u.role()).put("disabled", u.disabled())
                .put("created_at", u.createdAt().toString());
    }
}
