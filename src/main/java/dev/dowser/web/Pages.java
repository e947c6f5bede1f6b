package dev.dowser.web;

import io.undertow.server.HttpServerExchange;
import io.undertow.util.Headers;
import java.nio.charset.StandardCharsets;

/**
 * The pages the gate answers itself (a page the role may not open, a page that does not exist),
 * in the frame of every other page, with the way back.
 */
final class Pages {

    private Pages() {
    }

    /** Sends a page with {@code status}, a title and a message; text is escaped, never markup. */
    static void send(HttpServerExchange ex, int status, String title, String message) {
        String html = "<!doctype html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
                + "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n"
                + "<title>Dowser · " + escape(title) + "</title>\n"
                + "<link rel=\"stylesheet\" href=\"/css/dowser.css\">\n</head>\n<body>\n"
                + "<header class=\"masthead\"><a class=\"brand\" href=\"/\">Dowser</a>"
                + "<span class=\"tagline\">" + escape(title) + "</span></header>\n"
                + "<main class=\"narrow\">\n<h1>" + escape(title) + "</h1>\n"
                + "<p class=\"message error\" id=\"page-message\">" + escape(message) + "</p>\n"
                + "<p class=\"actions\"><a class=\"button\" href=\"/\">Back to the pools</a>"
                + " <a class=\"button\" href=\"/login.html\">Sign in as someone else</a></p>\n"
                + "</main>\n</body>\n</html>\n";
        ex.setStatusCode(status);
        ex.getResponseHeaders().put(Headers.CONTENT_TYPE, "text/html; charset=utf-8");
        ex.getResponseHeaders().put(Headers.CACHE_CONTROL, "no-store");
        ex.getResponseSender().send(html, StandardCharsets.UTF_8);
    }

    static String escape(String s) {
        StringBuilder out = new StringBuilder(s.length() + 16);
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '<' -> out.append("&lt;");
                case '>' -> out.append("&gt;");
                case '&' -> out.append("&amp;");
                case '"' -> out.append("&quot;");
                case '\'' -> out.append("&#39;");
                default -> out.append(c);
            }
        }
        return out.toString();
    }
}
