package dev.dowser.cli;

import dev.dowser.sampler.SamplerConfig;
import dev.dowser.store.Database;
import dev.dowser.team.TeamConfig;
import dev.dowser.web.WebServer;
import java.nio.file.Path;
import java.util.concurrent.CountDownLatch;
import java.util.function.Consumer;

/**
 * Runs the web server until the process is told to stop, then shuts down in order. The commands
 * bind the port first ({@link WebServer#listen}) and only then open or create anything, so a busy
 * port leaves no trace.
 */
final class ServerRunner {

    /** The folder of a data folder where uploads wait while they are imported. */
    static final String UPLOADS = "uploads";

    private ServerRunner() {
    }

    /**
     * Serves {@code db} on the bound {@code server} (uploads spooled in {@code dataDir/uploads}),
     * prints the banner, calls {@code onStart}, waits for the end.
     */
    static void runUntilStopped(WebServer server, Database db, Path dataDir, String banner,
                                Consumer<WebServer> onStart) {
        try {
            server.serve(db, dataDir.resolve(UPLOADS), SamplerConfig.defaults(),
                    TeamConfig.defaults());
            onStart.accept(server);
        } catch (RuntimeException e) {
            server.close();
            db.close();
            throw e;
        }
        CountDownLatch stopped = new CountDownLatch(1);
        Runtime.getRuntime().addShutdownHook(new Thread(() -> {
            System.err.println("dowser: stopping; letting requests in flight finish");
            server.close();
            db.close();
            stopped.countDown();
        }, "dowser-shutdown"));
        System.out.println(banner.replace("{address}", server.address()));
        System.out.flush();
        try {
            stopped.await();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    /** Closes the listening server when opening what it would serve fails. */
    static <T> T orClose(WebServer server, java.util.function.Supplier<T> open) {
        try {
            return open.get();
        } catch (RuntimeException e) {
            server.close();
            throw e;
        }
    }
}
