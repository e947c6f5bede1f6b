package dev.dowser.cli;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * {@code dowser serve} as a separate process on a free loopback port: started, read until it says
 * where it listens, then killed without warning (SIGKILL) or stopped in order (SIGTERM). Its
 * output, after the line that names its port, and its standard error go to a log file.
 */
final class ServerProcess implements AutoCloseable {

    /** How long a start may take before it counts as failed: a JVM, Flyway and Undertow on a busy machine. */
    static final Duration START_DEADLINE = Duration.ofSeconds(90);
    private static final Pattern ADDRESS = Pattern.compile("https?://[^/ ]+:(\\d+)/");

    private final Process process;
    private final int port;

    private ServerProcess(Process process, int port) {
        this.process = process;
        this.port = port;
    }

    /**
     * The java command that runs Dowser's main class: this JVM's own binary and class path, so a
     * benchmark run from the jar starts the same jar.
     */
    static List<String> sameJava(String... jvmOptions) {
        List<String> cmd = new ArrayList<>();
        cmd.add(Path.of(System.getProperty("java.home"), "bin", "java").toString());
        cmd.addAll(List.of(jvmOptions));
        cmd.addAll(List.of("-cp", System.getProperty("java.class.path"), Main.class.getName()));
        return cmd;
    }

    /** Runs {@code launcher} + {@code serve --data DIR --port 0} and waits until it listens. */
    static ServerProcess start(List<String> launcher, Path dataDir, Path log) throws IOException {
        return start(launcher, dataDir, log, Map.of());
    }

    /** As {@link #start(List, Path, Path)}, with {@code options} (name, value, ...) in the environment and after serve. */
    static ServerProcess start(List<String> launcher, Path dataDir, Path log, Map<String, String> environment,
            String... options) throws IOException {
        List<String> cmd = new ArrayList<>(launcher);
        cmd.addAll(List.of("serve", "--data", dataDir.toString(), "--port", "0"));
        cmd.addAll(List.of(options));
        ProcessBuilder builder = new ProcessBuilder(cmd).redirectError(ProcessBuilder.Redirect.appendTo(log.toFile()));
        builder.environment().putAll(environment);
        Process p = builder.start();
        CompletableFuture<Integer> listening = CompletableFuture.supplyAsync(() -> readPort(p, log));
        try {
            return new ServerProcess(p, listening.get(START_DEADLINE.toSeconds(), TimeUnit.SECONDS));
        } catch (InterruptedException e) {
            p.destroyForcibly();
            Thread.currentThread().interrupt();
            throw new IOException("interrupted while the server started", e);
        } catch (ExecutionException | TimeoutException e) {
            p.destroyForcibly();
            throw new IOException("the server did not start within " + START_DEADLINE.toSeconds() + " s (see " + log
                    + "): " + (e.getCause() != null ? e.getCause().getMessage() : e.getMessage()), e);
        }
    }

    /** Reads standard output until the banner names the port; the rest of the output is drained. */
    private static int readPort(Process p, Path log) {
        BufferedReader out = new BufferedReader(new InputStreamReader(p.getInputStream(), StandardCharsets.UTF_8));
        try {
            String line;
            while ((line = out.readLine()) != null) {
                Matcher m = ADDRESS.matcher(line);
                if (m.find()) {
                    int port = Integer.parseInt(m.group(1));
                    Thread drain = new Thread(() -> drain(out, log), "server-stdout");
                    drain.setDaemon(true);
                    drain.start();
                    return port;
                }
            }
        } catch (IOException e) {
            throw new IllegalStateException("cannot read the server's output: " + e.getMessage(), e);
        }
        throw new IllegalStateException("the server exited (status " + waitQuietly(p) + ") before it listened");
    }

    /** Copies the rest of the server's output to the log beside its standard error, so the process never blocks on it. */
    private static void drain(BufferedReader out, Path log) {
        try (Writer w = Files.newBufferedWriter(log, StandardCharsets.UTF_8, StandardOpenOption.CREATE,
                StandardOpenOption.APPEND)) {
            String line;
            while ((line = out.readLine()) != null) {
                w.write(line);
                w.write('\n');
                w.flush();
            }
        } catch (IOException ignored) {
            // The process ended.
        }
    }

    private static int waitQuietly(Process p) {
        try {
            return p.waitFor();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return -1;
        }
    }

    int port() {
        return port;
    }

    long pid() {
        return process.pid();
    }

    /** SIGKILL: the process ends at once, with no chance to flush or close anything. */
    void kill() throws InterruptedException {
        process.destroyForcibly();
        process.waitFor();
    }

    /** SIGTERM: the server's shutdown hook stops rounds at a safe point and closes the database; the exit status. */
    int terminate(Duration deadline) throws InterruptedException {
        process.destroy();
        if (!process.waitFor(deadline.toMillis(), TimeUnit.MILLISECONDS)) {
            process.destroyForcibly();
            process.waitFor();
            throw new IllegalStateException("the server did not stop within " + deadline.toSeconds()
                    + " s of SIGTERM; killed");
        }
        return process.exitValue();
    }

    @Override
    public void close() {
        if (process.isAlive()) {
            process.destroyForcibly();
            waitQuietly(process);
        }
    }
}
