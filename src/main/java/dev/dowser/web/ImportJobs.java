package dev.dowser.web;

import dev.dowser.data.ImportException;
import dev.dowser.data.ImportResult;
import dev.dowser.data.ImportSpec;
import dev.dowser.data.Importer;
import dev.dowser.store.Database;
import dev.dowser.words.Worded;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicLong;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Imports uploaded through the API: the upload is spooled to disk as it arrives (refused past the
 * size limit, so memory stays bounded whatever its size), then imported on one background thread
 * while its progress can be asked for. Spooling first keeps a slow upload from holding the import
 * thread and an open database transaction for as long as the network takes.
 */
final class ImportJobs implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(ImportJobs.class);
    static final int SPOOL_BUFFER_BYTES = 1 << 16;

    /** Where an import stands; its word is what the API sends. */
    enum State implements Worded { QUEUED, RUNNING, DONE, FAILED }

    /** What an import has done so far; a finished job has a result or an error. */
    record Status(long id, String pool, State state, long records, long bytesRead, long totalBytes,
                  ImportResult result, String error) {
    }

    private final Database db;
    private final Path spoolDir;
    private final long maxUploadBytes;
    private final String uploadLimit;
    private final ExecutorService worker = Executors.newSingleThreadExecutor(r -> {
        Thread t = new Thread(r, "dowser-import");
        t.setDaemon(true);
        return t;
    });
    private final AtomicLong nextId = new AtomicLong(1);
    private final Map<Long, Status> jobs = new ConcurrentHashMap<>();

    ImportJobs(Database db, WebConfig config) {
        this.db = db;
        this.spoolDir = config.spoolDir();
        this.maxUploadBytes = config.maxUploadBytes();
        this.uploadLimit = config.uploadLimitText();
        removeLeftovers(spoolDir);
    }

    /** Uploads spooled by a server that stopped before importing them are of no further use. */
    private static void removeLeftovers(Path spoolDir) {
        if (!Files.isDirectory(spoolDir)) {
            return;
        }
        try (var files = Files.newDirectoryStream(spoolDir, "upload-*.part")) {
            for (Path f : files) {
                Files.deleteIfExists(f);
            }
        } catch (IOException e) {
            LOG.warn("cannot clean the upload folder {}", spoolDir, e);
        }
    }

    /** A queued import: its id, and its final status once done. */
    record Submission(long id, Future<Status> done) {
    }

    /** Spools the upload and queues its import. */
    Submission submit(InputStream body, String fileName, ImportSpec spec) {
        Path spooled = spool(body);
        long id = nextId.getAndIncrement();
        long total;
        try {
            total = Files.size(spooled);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        jobs.put(id, new Status(id, spec.poolName(), State.QUEUED, 0, 0, total, null, null));
        return new Submission(id, worker.submit(() -> run(id, spooled, fileName, spec, total)));
    }

    private Status run(long id, Path spooled, String fileName, ImportSpec spec, long total) {
        try (InputStream in = Files.newInputStream(spooled)) {
            jobs.put(id, new Status(id, spec.poolName(), State.RUNNING, 0, 0, total, null, null));
            ImportResult r = new Importer(db).run(in, fileName, spec, (rows, bytes) ->
                    jobs.put(id, new Status(id, spec.poolName(), State.RUNNING, rows, bytes, total, null, null)));
            return put(new Status(id, spec.poolName(), State.DONE, r.records(), total, total, r, null));
        } catch (ImportException e) {
            return put(new Status(id, spec.poolName(), State.FAILED, 0, 0, total, null, e.getMessage()));
        } catch (IOException | RuntimeException e) {
            LOG.error("import {} failed", id, e);
            return put(new Status(id, spec.poolName(), State.FAILED, 0, 0, total, null,
                    "the import failed unexpectedly: " + e.getMessage()));
        } finally {
            try {
                Files.deleteIfExists(spooled);
            } catch (IOException e) {
                LOG.warn("cannot delete spooled upload {}", spooled, e);
            }
        }
    }

    private Status put(Status s) {
        jobs.put(s.id(), s);
        return s;
    }

    Status status(long id) {
        Status s = jobs.get(id);
        if (s == null) {
            throw new ApiException(404, "no import with id " + id);
        }
        return s;
    }

    /** The refusal of an upload of {@code size} (as people read it) past the server's limit. */
    static ApiException tooLarge(String size, WebConfig config) {
        return new ApiException(413, "the upload is " + size + ", larger than the limit of "
                + config.uploadLimitText() + "; nothing was imported");
    }

    /** Refuses an upload of {@code declared} bytes at once when the upload folder has no room for it. */
    void checkRoom(long declared) {
        try {
            Files.createDirectories(spoolDir);
            long free = Files.getFileStore(spoolDir).getUsableSpace();
            if (declared > free) {
                throw new ApiException(507, "the server's upload folder " + spoolDir + " has " + Bytes.text(free)
                        + " free, too little for this upload of " + Bytes.text(declared) + "; nothing was imported");
            }
        } catch (IOException e) {
            throw new UncheckedIOException("cannot prepare the upload folder " + spoolDir + ": " + e.getMessage(), e);
        }
    }

    /** Copies the upload to a file of the upload folder, refusing it past the limit; on any failure the file goes. */
    private Path spool(InputStream body) {
        Path file = null;
        try {
            Files.createDirectories(spoolDir);
            file = Files.createTempFile(spoolDir, "upload-", ".part");
            long written = 0;
            byte[] buf = new byte[SPOOL_BUFFER_BYTES];
            try (var out = Files.newOutputStream(file)) {
                int n;
                while ((n = body.read(buf)) >= 0) {
                    written += n;
                    if (written > maxUploadBytes) {
                        throw new ApiException(413, "the upload is larger than the limit of " + uploadLimit
                                + "; nothing was imported");
                    }
                    try {
                        out.write(buf, 0, n);
                    } catch (IOException e) {
                        throw new ApiException(507, "the server could not store the upload in " + spoolDir + " ("
                                + e.getMessage() + "), after " + Bytes.text(written) + "; nothing was imported");
                    }
                }
            }
            return file;
        } catch (IOException | RuntimeException e) {
            if (file != null) {
                try {
                    Files.deleteIfExists(file);
                } catch (IOException ignored) {
                    // The spool folder is cleaned at the next start anyway.
                }
            }
            if (e instanceof RuntimeException re) {
                throw re;
            }
            throw new UncheckedIOException("cannot receive the upload: " + e.getMessage(), (IOException) e);
        }
    }

    @Override
    public void close() {
        worker.shutdown();
        try {
            if (!worker.awaitTermination(30, TimeUnit.SECONDS)) {
                worker.shutdownNow();
            }
        } catch (InterruptedException e) {
            worker.shutdownNow();
            Thread.currentThread().interrupt();
        }
    }
}
