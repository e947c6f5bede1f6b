package dev.dowser.cli;

import dev.dowser.web.WebConfig;
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

    @Override
    public Integer call() {
        WebConfig config = new WebConfig(bind, port, maxUploadMib << 20, data.dir.resolve("uploads"), trustProxy);
        ServerRunner.runUntilStopped(data.open(), config, "Dowser is serving {address}  (data: "
                + data.dir.toAbsolutePath() + ")");
        return 0;
    }
}
