package dev.dowser.cli;

import dev.dowser.store.Database;
import dev.dowser.web.WebConfig;
import dev.dowser.web.WebServer;
import java.util.concurrent.CountDownLatch;
import java.util.function.Consumer;

/** Runs the web server until the process is told to stop, then shuts down in order. */
final class ServerRunner {

    private ServerRunner() {
    }

    static void runUntilStopped(Database db, WebConfig config, String banner) {
        runUntilStopped(db, config, banner, server -> { });
    }

    /** As above, calling {@code onStart} once the server listens. */
    static void runUntilStopped(Database db, WebConfig config, String banner,
                                Consumer<WebServer> onStart) {
        WebServer server = WebServer.start(db, config);
        onStart.accept(server);
        CountDownLatch stopped = new CountDownLatch(1);
        Runtime.getRuntime().addShutdownHook(new Thread(() -> {
            System.err.println("dowser: stopping; letting requests in flight finish");
            server.close();
            db.close();
            stopped.countDown();
        }, "dowser-shutdown"));
        System.out.println(banner.replace("{address}", server.address()));
        server.setupCode().ifPresent(code -> System.out.println("No account yet: open " + server.address()
                + "login.html and create the first admin with the one-time setup code " + code));
        System.out.flush();
        try {
            stopped.await();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }
}
