package dev.dowser.web;

import static dev.dowser.web.Requests.intQuery;
import static dev.dowser.web.Requests.listQuery;
import static dev.dowser.web.Requests.param;
import static dev.dowser.web.Requests.query;
import static dev.dowser.web.Requests.requiredQuery;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.data.FileFormat;
import dev.dowser.data.ImportResult;
import dev.dowser.data.ImportSpec;
import dev.dowser.data.Preview;
import dev.dowser.json.Json;
import io.undertow.server.HttpServerExchange;
import java.io.ByteArrayInputStream;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.Future;

/** Adding pools from files: the mapping step's preview of a file's head, the upload, and its progress. */
final class ImportsApi {

    /** The head of a file that the mapping step reads; the page sends no more than this. */
    static final int MAX_PREVIEW_BYTES = 1 << 20;

    private final ImportJobs imports;
    private final WebConfig config;

    ImportsApi(ImportJobs imports, WebConfig config) {
        this.imports = imports;
        this.config = config;
    }

    void startImport(HttpServerExchange ex) {
        String pool = requiredQuery(ex, "pool");
        String fileName = query(ex, "file_name", "upload");
        String formatWord = query(ex, "format", null);
        FileFormat format = formatWord == null ? FileFormat.fromFileName(fileName) : FileFormat.parse(formatWord);
        ImportSpec spec = new ImportSpec(pool, format, query(ex, "id", null), listQuery(ex, "features"),
                listQuery(ex, "display"), query(ex, "label", null), listQuery(ex, "classes"),
                listQuery(ex, "categorical"), intQuery(ex, "max_levels", ImportSpec.DEFAULT_MAX_LEVELS, 2, 1_000_000),
                intQuery(ex, "max_field_chars", ImportSpec.DEFAULT_MAX_FIELD_CHARS, 16, Json.MAX_STRING_CHARS),
                ImportSpec.UNLIMITED_BYTES, "import").withMissingTokens(missingTokens(ex));
        if (!spec.namesLabelSet()) {
            throw new ApiException(400, "a pool needs classes for people to choose from: add classes=a,b,c to"
                    + " the call, or label=COLUMN naming the column that holds labels already given");
        }
        long declared = ex.getRequestContentLength();
        if (declared > 0) {
            imports.checkRoom(declared);
        }
        UploadStream body = new UploadStream(LingeringClose.take(ex), config.limits().uploadStallMillis(),
                received -> ImportJobs.tooLarge("over " + Bytes.text(config.maxUploadBytes()), config));
        ImportJobs.Submission job = imports.submit(body, fileName, spec);
        if (Boolean.parseBoolean(query(ex, "wait", "false"))) {
            ImportJobs.Status done = await(job.done());
            Responses.json(ex, done.state() == ImportJobs.State.DONE ? 201 : 400, statusJson(done));
        } else {
            Responses.json(ex, 202, statusJson(imports.status(job.id())));
        }
    }

    /** The body (read by the gate, at most {@value #MAX_PREVIEW_BYTES} bytes) is the head of a file. */
    void preview(HttpServerExchange ex) {
        String fileName = query(ex, "file_name", "upload");
        String formatWord = query(ex, "format", null);
        FileFormat format = formatWord == null ? FileFormat.fromFileName(fileName) : FileFormat.parse(formatWord);
        byte[] head = Bodies.of(ex);
        Preview p = Preview.of(new ByteArrayInputStream(head), format, Preview.DEFAULT_ROWS);
        ObjectNode body = Json.object().put("format", format.word());
        ArrayNode columns = body.putArray("columns");
        for (int c = 0; c < p.columns().size(); c++) {
            columns.addObject().put("name", p.columns().get(c)).put("kind", p.kinds().get(c))
                    .put("numeric", p.kinds().get(c).equals(Preview.NUMBER)).put("filled", p.filled().get(c))
                    .put("distinct", p.distinct().get(c)).put("unique", p.unique(c));
        }
        body.put("sampled", p.sampled());
        body.set("rows", Json.mapper().valueToTree(p.rows()));
        body.set("suggested", Json.mapper().valueToTree(p.suggested()));
        // The page checks a file's size against this before sending it; the server refuses past it anyway.
        body.putObject("upload_limit").put("bytes", config.maxUploadBytes()).put("text", config.uploadLimitText());
        Responses.ok(ex, body);
    }

    void importStatus(HttpServerExchange ex) {
        long id;
        try {
            id = Long.parseLong(param(ex, "id"));
        } catch (NumberFormatException e) {
            throw new ApiException(400, "import id must be a number");
        }
        Responses.ok(ex, statusJson(imports.status(id)));
    }

    static ObjectNode statusJson(ImportJobs.Status s) {
        ObjectNode n = Json.object().put("id", s.id()).put("pool", s.pool()).put("state", s.state().word())
                .put("records", s.records()).put("bytes_read", s.bytesRead()).put("total_bytes", s.totalBytes())
                .put("error", s.error());
        if (s.result() != null) {
            ImportResult r = s.result();
            ObjectNode result = n.putObject("result").put("records", r.records()).put("labelled", r.labelled())
                    .put("features", r.features()).put("seconds", r.seconds());
            result.set("classes", Json.mapper().valueToTree(r.classes()));
        }
        return n;
    }

    private static ImportJobs.Status await(Future<ImportJobs.Status> job) {
        try {
            return job.get();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new ApiException(503, "the server is shutting down");
        } catch (ExecutionException e) {
            throw new IllegalStateException(e.getCause());
        }
    }

    /** {@code missing=NA,?}: the values that mean missing, as import's --missing; absent, the defaults; empty, none. */
    private static java.util.List<String> missingTokens(HttpServerExchange ex) {
        java.util.Deque<String> given = ex.getQueryParameters().get("missing");
        String v = given == null || given.isEmpty() ? null : given.getFirst();
        return v == null ? ImportSpec.DEFAULT_MISSING_TOKENS
                : java.util.Arrays.stream(v.split(",")).map(String::strip).filter(t -> !t.isEmpty()).toList();
    }
}
