package dev.dowser.web;

import io.undertow.server.HttpHandler;
import io.undertow.server.handlers.resource.ClassPathResourceManager;
import io.undertow.server.handlers.resource.ResourceHandler;
import io.undertow.util.Headers;

/** The pages, scripts and styles under {@code web/}, served from the jar; {@link Gate} adds the security headers. */
final class StaticFiles {

    /** Pages revalidate on every load so a new version is seen at once; assets may be cached briefly. */
    static final String PAGE_CACHE = "no-cache";
    static final String ASSET_CACHE = "public, max-age=300";

    private StaticFiles() {
    }

    static HttpHandler handler() {
        ResourceHandler files = new ResourceHandler(
                new ClassPathResourceManager(StaticFiles.class.getClassLoader(), "web"))
                .setWelcomeFiles("index.html")
                .setDirectoryListingEnabled(false);
        return exchange -> {
            String path = exchange.getRelativePath();
            boolean page = path.endsWith("/") || path.endsWith(".html");
            exchange.getResponseHeaders().put(Headers.CACHE_CONTROL, page ? PAGE_CACHE : ASSET_CACHE);
            files.handleRequest(exchange);
        };
    }
}
