package dev.dowser.cli;

import dev.dowser.store.Database;
import dev.dowser.team.Accounts;
import dev.dowser.team.TeamConfig;
import dev.dowser.web.TlsConfig;
import dev.dowser.web.WebConfig;
import dev.dowser.web.WebServer;
import java.nio.file.Path;
import java.security.SecureRandom;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

@Command(name = "serve", mixinStandardHelpOptions = true,
        description = {"Runs the web app on the database in --data (or on the PostgreSQL server given by --database-url)"
                + " until stopped (Ctrl-C).",
            "The database needs an admin first: dowser users add NAME --role admin --data DIR (with the same"
                + " --database-url and --database-user when on PostgreSQL).",
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

    @Option(names = WebConfig.MAX_UPLOAD_OPTION, defaultValue = "" + WebConfig.DEFAULT_MAX_UPLOAD_MIB, paramLabel = "N",
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
        if (maxUploadMib < 1 || maxUploadMib > 1L << 40) {
            throw new IllegalArgumentException(WebConfig.MAX_UPLOAD_OPTION + " must be 1 to " + (1L << 40) + ", got "
                    + maxUploadMib);
        }
        WebConfig config = new WebConfig(bind, port, maxUploadMib << 20, data.dir.resolve(ServerRunner.UPLOADS), trustProxy, null);
        if (tlsKeystore != null) {
            String password = System.getenv(tlsPasswordEnv);
            if (password == null) {
                throw new IllegalArgumentException("set the environment variable " + tlsPasswordEnv
                        + " to the keystore's password (a password on the command line would show in the process list)");
            }
            config = config.withTls(new TlsConfig(tlsKeystore, password));
        }
        // Nothing is written before the port is bound: a fresh folder is refused untouched, a busy port found first.
        if (!data.shared() && !Database.exists(data.dir)) {
            throw new IllegalArgumentException(noAdmin("there is no database in " + data.dir + " yet"));
        }
        WebServer server = WebServer.listen(config);
        Database db = ServerRunner.orClose(server, data::open);
        if (!new Accounts(db, new SecureRandom(), TeamConfig.defaults()).hasAdmin()) {
            server.close();
            db.close();
            throw new IllegalArgumentException(noAdmin(data.where() + " has no enabled admin"));
        }
        String where = data.shared() ? "database: " + data.url + "; uploads: " + data.dir.toAbsolutePath()
                : "data: " + data.dir.toAbsolutePath();
        ServerRunner.runUntilStopped(server, db, data.dir, "Dowser is serving {address}  (" + where + ")", s -> { });
        return 0;
    }

    /** The refusal to serve without an admin, with the command that makes one. */
    private String noAdmin(String why) {
        return why + ", and a server needs an admin to manage it. Make the first one here with\n"
                + "  dowser users add NAME --role admin " + data.asArguments() + "\n"
                + "(it prints a password to sign in with), then start dowser serve again.";
    }
}
