package dev.dowser.cli;

import dev.dowser.web.TlsConfig;
import dev.dowser.web.WebConfig;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

@Command(name = "serve", mixinStandardHelpOptions = true,
        description = {"Runs the web app on the database in --data until stopped (Ctrl-C).",
            "Listens on loopback by default; put it behind your own network and TLS before letting others"
                + " reach it."})
final class ServeCommand implements Callable<Integer> {

    @Mixin
    DataOption data;

    @Option(names = "--port", defaultValue = "" + WebConfig.DEFAULT_PORT, paramLabel = "P",
            description = "TCP port (default: ${DEFAULT-VALUE}).")
    int port;

    @Option(names = "--bind", defaultValue = WebConfig.DEFAULT_BIND, paramLabel = "ADDR",
            description = "Address to listen on (default: ${DEFAULT-VALUE}).")
    String bind;

    @Option(names = "--max-upload-mib", defaultValue = "2048", paramLabel = "N",
            description = "Largest import upload accepted, in MiB (default: ${DEFAULT-VALUE}).")
    long maxUploadMib;

    @Option(names = "--trust-proxy", description = "Behind a TLS proxy on this host: believe its X-Forwarded-*"
            + " headers, so that session cookies are marked Secure. Never with the port open to clients.")
    boolean trustProxy;

    @Option(names = "--tls-keystore", paramLabel = "FILE", description = "Serve HTTPS with this PKCS#12 keystore"
            + " (the server's key and certificate); its password is read from the environment variable named by"
            + " --tls-password-env.")
    Path tlsKeystore;

    @Option(names = "--tls-password-env", paramLabel = "VAR", defaultValue = DEFAULT_TLS_PASSWORD_ENV,
            description = "Environment variable holding the keystore's password (default: ${DEFAULT-VALUE}).")
    String tlsPasswordEnv;

    static final String DEFAULT_TLS_PASSWORD_ENV = "DOWSER_TLS_PASSWORD";

    @Override
    public Integer call() {
        WebConfig config = new WebConfig(bind, port, maxUploadMib << 20, data.dir.resolve("uploads"), trustProxy, null);
        if (tlsKeystore != null) {
            String password = System.getenv(tlsPasswordEnv);
            if (password == null) {
                throw new IllegalArgumentException("set the environment variable " + tlsPasswordEnv
                        + " to the keystore's password (a password on the command line would show in the process list)");
            }
            config = config.withTls(new TlsConfig(tlsKeystore, password));
        }
        ServerRunner.runUntilStopped(data.open(), config, "Dowser is serving {address}  (data: "
                + data.dir.toAbsolutePath() + ")");
        return 0;
    }
}
