package dev.dowser.web;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.data.ColumnRoles;
import dev.dowser.data.Exporter;
import dev.dowser.data.FeatureColumn;
import dev.dowser.data.FeatureSchema;
import dev.dowser.data.FileFormat;
import dev.dowser.data.ImportResult;
import dev.dowser.data.ImportSpec;
import dev.dowser.data.LabelKeys;
import dev.dowser.json.Json;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import dev.dowser.store.PoolSummary;
import dev.dowser.store.QueueEntry;
import dev.dowser.store.RecordRow;
import dev.dowser.store.RoundStore;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Rounds;
import io.undertow.server.HttpServerExchange;
import io.undertow.server.RoutingHandler;
import io.undertow.util.Headers;
import java.io.IOException;
import java.util.Arrays;
import java.util.Deque;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.Future;

/**
 * The JSON API under {@code /api/v1} (route paths here are relative to it). Each handler parses,
 * calls one method, and sends; every error becomes a JSON response in {@link Errors}.
 */
final class Api {

    static final String PREFIX = "/api/v1";
    static final int DEFAULT_PAGE = 50;
    static final int MAX_LABEL_BODY_BYTES = 16_384;

    private final Database db;
    private final ImportJobs imports;
    private final Rounds rounds;

    Api(Database db, ImportJobs imports, Rounds rounds) {
        this.db = db;
        this.imports = imports;
        this.rounds = rounds;
    }

    RoutingHandler routes() {
        return new RoutingHandler()
                .get("/pools", this::listPools)
                .get("/pools/{pool}", this::pool)
                .get("/pools/{pool}/records", this::records)
                .post("/pools/{pool}/labels", this::addLabel)
                .get("/pools/{pool}/rounds", this::listRounds)
                .post("/pools/{pool}/rounds", this::requestRound)
                .post("/pools/{pool}/queue/next", this::nextRecord)
                .get("/pools/{pool}/export", this::export)
                .post("/imports", this::startImport)
                .get("/imports/{id}", this::importStatus)
                .setFallbackHandler(ex -> {
                    throw new ApiException(404, "no such resource: " + ex.getRequestMethod() + " "
                            + ex.getRequestPath());
                })
                .setInvalidMethodHandler(ex -> {
                    throw new ApiException(405, ex.getRequestMethod() + " is not allowed on " + ex.getRequestPath());
                });
    }

    private void listPools(HttpServerExchange ex) {
        ArrayNode pools = Json.array();
        for (PoolSummary p : db.pools().list()) {
            ObjectNode n = pools.addObject()
                    .put("name", p.name())
                    .put("records", p.recordCount())
                    .put("labelled", p.labelledCount())
                    .put("created_at", p.createdAt().toString());
            n.set("label_counts", Json.mapper().valueToTree(p.labelCounts()));
        }
        Responses.ok(ex, Json.object().set("pools", pools));
    }

    private void pool(HttpServerExchange ex) {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        Map<String, Long> counts = db.pools().labelCounts(pool);
        ObjectNode body = Json.object()
                .put("name", pool.name())
                .put("records", pool.recordCount())
                .put("created_at", pool.createdAt().toString());
        ArrayNode classes = body.putArray("classes");
        List<String> keys = LabelKeys.keysFor(pool.classes());
        for (int i = 0; i < pool.classes().size(); i++) {
            classes.addObject().put("name", pool.classes().get(i)).put("key", keys.get(i))
                    .put("labelled", counts.getOrDefault(pool.classes().get(i), 0L));
        }
        body.set("roles", Json.mapper().valueToTree(Json.read(pool.columnRolesJson(), ColumnRoles.class)));
        FeatureSchema schema = Json.read(pool.featureSchemaJson(), FeatureSchema.class);
        ArrayNode features = body.putArray("features");
        for (FeatureColumn c : schema.columns()) {
            ObjectNode f = features.addObject().put("name", c.name()).put("kind", c.kind().name().toLowerCase())
                    .put("width", c.encodedWidth()).put("missing", c.missing());
            if (c.kind() == dev.dowser.data.FeatureKind.CATEGORICAL) {
                f.set("levels", Json.mapper().valueToTree(c.levels()));
            } else {
                f.set("mean", Json.mapper().valueToTree(c.mean()));
                f.set("sd", Json.mapper().valueToTree(c.sd()));
            }
        }
        body.put("feature_width", schema.encodedWidth());
        Responses.ok(ex, body);
    }

    private void records(HttpServerExchange ex) {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        long offset = longQuery(ex, "offset", 0);
        int limit = (int) longQuery(ex, "limit", DEFAULT_PAGE);
        List<String> display = Json.read(pool.columnRolesJson(), ColumnRoles.class).display();
        ArrayNode rows = Json.array();
        for (RecordRow r : db.records().page(pool.id(), offset, limit)) {
            rows.add(recordJson(r, display));
        }
        ObjectNode body = Json.object().put("offset", offset).put("limit", limit).put("total", pool.recordCount());
        body.set("records", rows);
        Responses.ok(ex, body);
    }

    static ObjectNode recordJson(RecordRow r, List<String> display) {
        ObjectNode n = Json.object().put("id", r.key()).put("row", r.row()).put("line", r.sourceLine());
        ObjectNode fields = n.putObject("fields");
        for (int i = 0; i < display.size(); i++) {
            fields.put(display.get(i), r.display().get(i));
        }
        n.put("label", r.label()).put("labelled_by", r.labelledBy())
                .put("labelled_at", r.labelledAt() == null ? null : r.labelledAt().toString())
                .put("note", r.note());
        return n;
    }

    private void addLabel(HttpServerExchange ex) throws IOException {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        JsonNode body = jsonBody(ex, "a label request");
        String record = requiredText(body, "record");
        String label = requiredText(body, "label");
        String by = requiredText(body, "labelled_by");
        String note = body.hasNonNull("note") ? body.get("note").asText() : null;
        if (!pool.classes().contains(label)) {
            throw new ApiException(400, "label '" + label + "' is not one of the classes "
                    + String.join(", ", pool.classes()));
        }
        long row = db.records().rowOf(pool.id(), record).orElseThrow(() ->
                new ApiException(404, "no record '" + record + "' in pool '" + pool.name() + "'"));
        db.labels().add(pool.id(), row, label, by, note);
        rounds.worker(pool.name()).labelAdded();
        RecordRow r = db.records().page(pool.id(), row, 1).get(0);
        Responses.json(ex, 201, recordJson(r, Json.read(pool.columnRolesJson(), ColumnRoles.class).display()));
    }

    private void listRounds(HttpServerExchange ex) {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        ArrayNode out = Json.array();
        for (RoundStore.RoundRow r : db.rounds().list(pool.id())) {
            ObjectNode n = out.addObject().put("round", r.round()).put("status", r.status())
                    .put("started_at", r.startedAt().toString())
                    .put("finished_at", r.finishedAt() == null ? null : r.finishedAt().toString())
                    .put("labels_at_start", r.labelsAtStart()).put("kernel", r.kernel()).put("message", r.message());
            if (r.healthJson() != null) {
                n.set("health", Json.tree(r.healthJson()));
            }
        }
        ObjectNode body = Json.object();
        body.set("rounds", out);
        db.queues().servedRound(pool.id()).ifPresent(round -> body.put("served_round", round));
        body.put("labels_to_next_round", rounds.worker(pool.name()).labelsToNextRound());
        Responses.ok(ex, body);
    }

    private void requestRound(HttpServerExchange ex) {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        rounds.worker(pool.name()).request();
        Responses.json(ex, 202, Json.object().put("requested", true));
    }

    /** Leases the next record of the served queue to the person named in the body. */
    private void nextRecord(HttpServerExchange ex) throws IOException {
        PoolRow pool = db.pools().require(param(ex, "pool"));
        String person = requiredText(jsonBody(ex, "a request"), "person");
        if (person.length() > dev.dowser.store.LabelStore.MAX_LABELLER_CHARS) {
            throw new ApiException(400, "person must be at most " + dev.dowser.store.LabelStore.MAX_LABELLER_CHARS
                    + " characters");
        }
        int leaseMinutes = PoolSettings.parse(pool.settingsJson()).leaseMinutes();
        java.util.Optional<QueueEntry> next = db.queues().lease(pool.id(), person, java.time.Duration.ofMinutes(leaseMinutes));
        if (next.isEmpty()) {
            Responses.json(ex, 200, Json.object().putNull("record").put("message",
                    "nothing to label in the served queue; the next round will bring more"));
            return;
        }
        QueueEntry e = next.get();
        RecordRow r = db.records().page(pool.id(), e.row(), 1).get(0);
        ObjectNode body = Json.object().put("round", e.round()).put("position", e.position())
                .put("spot_check", e.spotCheck()).put("score", e.score()).put("lease_until", e.leaseUntil().toString());
        body.set("record", recordJson(r, Json.read(pool.columnRolesJson(), ColumnRoles.class).display()));
        if (e.predictionJson() != null && !e.spotCheck()) {
            // Spot checks stay an honest test: the model's belief is not shown for them.
            body.set("prediction", Json.tree(e.predictionJson()));
        }
        Responses.ok(ex, body);
    }

    private void export(HttpServerExchange ex) {
        String name = param(ex, "pool");
        db.pools().require(name);
        FileFormat format = FileFormat.parse(query(ex, "format", "csv"));
        ex.startBlocking();
        ex.getResponseHeaders().put(Headers.CONTENT_TYPE,
                format == FileFormat.CSV ? "text/csv; charset=utf-8" : "application/x-ndjson; charset=utf-8");
        ex.getResponseHeaders().put(Headers.CONTENT_DISPOSITION,
                "attachment; filename=\"" + name + "-labels." + format.word() + "\"");
        new Exporter(db).export(name, format, ex.getOutputStream());
    }

    private void startImport(HttpServerExchange ex) {
        String pool = requiredQuery(ex, "pool");
        String fileName = query(ex, "file_name", "upload");
        String formatWord = query(ex, "format", null);
        FileFormat format = formatWord == null ? FileFormat.fromFileName(fileName) : FileFormat.parse(formatWord);
        ImportSpec spec = new ImportSpec(pool, format, query(ex, "id", null), listQuery(ex, "features"),
                listQuery(ex, "display"), query(ex, "label", null), listQuery(ex, "classes"),
                listQuery(ex, "categorical"), (int) longQuery(ex, "max_levels", ImportSpec.DEFAULT_MAX_LEVELS),
                (int) longQuery(ex, "max_field_chars", ImportSpec.DEFAULT_MAX_FIELD_CHARS),
                ImportSpec.UNLIMITED_BYTES, "import");
        ex.startBlocking();
        ImportJobs.Submission job = imports.submit(ex.getInputStream(), fileName, spec);
        if (Boolean.parseBoolean(query(ex, "wait", "false"))) {
            ImportJobs.Status done = await(job.done());
            Responses.json(ex, "done".equals(done.state()) ? 201 : 400, statusJson(done));
        } else {
            Responses.json(ex, 202, statusJson(imports.status(job.id())));
        }
    }

    static ObjectNode statusJson(ImportJobs.Status s) {
        ObjectNode n = Json.object().put("id", s.id()).put("pool", s.pool()).put("state", s.state())
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

    private void importStatus(HttpServerExchange ex) {
        long id;
        try {
            id = Long.parseLong(param(ex, "id"));
        } catch (NumberFormatException e) {
            throw new ApiException(400, "import id must be a number");
        }
        Responses.ok(ex, statusJson(imports.status(id)));
    }

    private static String param(HttpServerExchange ex, String name) {
        return ex.getQueryParameters().get(name).getFirst();
    }

    static String query(HttpServerExchange ex, String name, String fallback) {
        Deque<String> v = ex.getQueryParameters().get(name);
        return v == null || v.isEmpty() || v.getFirst().isEmpty() ? fallback : v.getFirst();
    }

    private static String requiredQuery(HttpServerExchange ex, String name) {
        String v = query(ex, name, null);
        if (v == null) {
            throw new ApiException(400, "query parameter '" + name + "' is required");
        }
        return v;
    }

    private static List<String> listQuery(HttpServerExchange ex, String name) {
        String v = query(ex, name, null);
        return v == null ? List.of() : Arrays.stream(v.split(",")).map(String::strip).toList();
    }

    private static long longQuery(HttpServerExchange ex, String name, long fallback) {
        String v = query(ex, name, null);
        if (v == null) {
            return fallback;
        }
        try {
            return Long.parseLong(v.strip());
        } catch (NumberFormatException e) {
            throw new ApiException(400, "query parameter '" + name + "' must be a whole number, got '" + v + "'");
        }
    }

    /** The request's JSON body, refused past {@value #MAX_LABEL_BODY_BYTES} bytes; {@code what} names it in the error. */
    private static JsonNode jsonBody(HttpServerExchange ex, String what) throws IOException {
        ex.startBlocking();
        byte[] bytes = ex.getInputStream().readNBytes(MAX_LABEL_BODY_BYTES + 1);
        if (bytes.length > MAX_LABEL_BODY_BYTES) {
            throw new ApiException(413, what + " may hold at most " + MAX_LABEL_BODY_BYTES + " bytes");
        }
        return Json.tree(new String(bytes, java.nio.charset.StandardCharsets.UTF_8));
    }

    private static String requiredText(JsonNode body, String field) {
        JsonNode v = body.get(field);
        if (v == null || !v.isTextual() || v.asText().isBlank()) {
            throw new ApiException(400, "field '" + field + "' is required and must be a non-empty string");
        }
        return v.asText();
    }
}
