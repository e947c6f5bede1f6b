package dev.dowser.web;

import java.nio.file.Path;

/**
 * How the server listens and what it accepts; validated here, sealed afterwards.
 *
 * @param bind            address to listen on
 * @param port            TCP port; 0 picks a free one
 * @param maxUploadBytes  largest import upload accepted
 * @param spoolDir        where uploads wait while they are imported
 * @param trustProxy      true behind a TLS proxy on the same host: its X-Forwarded-Proto, -For and
 *                        -Host headers are believed, so cookies are marked Secure and sign-in limits
 *                        count the real address. Never set it when clients can reach the port directly.
 * @param tls             serve HTTPS with this keystore; null for plain HTTP
 * @param limits          how long slow clients are waited for, and how many people not signed in are served at once
 */
public record WebConfig(String bind, int port, long maxUploadBytes, Path spoolDir, boolean trustProxy,
                        TlsConfig tls, ClientLimits limits) {

    public static final String DEFAULT_BIND = "127.0.0.1";
    public static final int DEFAULT_PORT = 8080;
    public static final long DEFAULT_MAX_UPLOAD_MIB = 2048;
    public static final long DEFAULT_MAX_UPLOAD_BYTES = DEFAULT_MAX_UPLOAD_MIB << 20;
    /** The option of {@code dowser serve} that raises the upload limit; named in the refusal. */
    public static final String MAX_UPLOAD_OPTION = "--max-upload-mib";

    public WebConfig {
        if (bind == null || bind.isBlank()) {
            throw new IllegalArgumentException("bind address is empty; give an address such as 127.0.0.1");
        }
        if (port < 0 || port > 65_535) {
            throw new IllegalArgumentException("port " + port + " is out of range; use 1 to 65535, or 0 for any free port");
        }
        if (maxUploadBytes < 1) {
            throw new IllegalArgumentException("maxUploadBytes must be positive, got " + maxUploadBytes);
        }
        if (spoolDir == null) {
            throw new IllegalArgumentException("spoolDir is required");
        }
        if (limits == null) {
            throw new IllegalArgumentException("limits are required; ClientLimits.defaults() has the usual ones");
        }
    }

    /** With the usual limits for slow clients. */
    public WebConfig(String bind, int port, long maxUploadBytes, Path spoolDir, boolean trustProxy, TlsConfig tls) {
        this(bind, port, maxUploadBytes, spoolDir, trustProxy, tls, ClientLimits.defaults());
    }

    /** Plain HTTP, listening directly, trusting no forwarding headers. */
    public WebConfig(String bind, int port, long maxUploadBytes, Path spoolDir) {
        this(bind, port, maxUploadBytes, spoolDir, false, null);
    }

    /** The same, served over HTTPS with {@code t}. */
    public WebConfig withTls(TlsConfig t) {
        return new WebConfig(bind, port, maxUploadBytes, spoolDir, trustProxy, t, limits);
    }

    /** The same with other limits for slow clients. */
    public WebConfig withLimits(ClientLimits l) {
        return new WebConfig(bind, port, maxUploadBytes, spoolDir, trustProxy, tls, l);
    }

    /** The same spooling uploads in {@code dir}. */
    public WebConfig withSpoolDir(Path dir) {
        return new WebConfig(bind, port, maxUploadBytes, dir, trustProxy, tls, limits);
    }

    /** The same listening on another port. */
    public WebConfig withPort(int p) {
        return new WebConfig(bind, p, maxUploadBytes, spoolDir, trustProxy, tls, limits);
    }

    /** The upload limit as people read it, with the option that raises it. */
    public String uploadLimitText() {
        return Bytes.text(maxUploadBytes) + " (raise it with dowser serve " + MAX_UPLOAD_OPTION + ")";
    }
}
