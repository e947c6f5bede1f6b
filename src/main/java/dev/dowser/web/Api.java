package dev.dowser.web;

import static dev.dowser.web.Requests.listQuery;
import static dev.dowser.web.Requests.longQuery;
import static dev.dowser.web.Requests.param;
import static dev.dowser.web.Requests.query;
import static dev.dowser.web.Requests.requiredQuery;

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
import dev.dowser.data.Preview;
import dev.dowser.json.Json;
import dev.dowser.rounds.Rounds;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import dev.dowser.store.PoolSummary;
import dev.dowser.store.RecordRow;
import dev.dowser.team.Accounts;
import io.undertow.server.HttpServerExchange;
import io.undertow.server.RoutingHandler;
import io.undertow.util.Headers;
import java.io.IOException;
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
    /** The head of a file that the mapping step reads; the page sends no more than this. */
    static final int MAX_PREVIEW_BYTES = 1 << 20;

    private final Database db;
    private final ImportJobs imports;
    private final Rounds rounds;
    private final Events events;
    private final Accounts accounts;

    Api(Database db, ImportJobs imports, Rounds rounds, Events events, Accounts accounts) {
        this.db = db;
        this.imports = imports;
        this.rounds = rounds;
        this.events = events;
        this.accounts = accounts;
    }

    RoutingHandler routes() {
        RoutingHandler routes = new RoutingHandler();
        new DeskApi(db, rounds, events).addTo(routes);
        new RoundsApi(db, rounds).addTo(routes);
        new TeamApi(accounts).addTo(routes);
        new ReviewApi(db).addTo(routes);
        return routes
                .get("/pools", this::listPools)
                .get("/pools/{pool}", this::pool)
                .get("/pools/{pool}/records", this::records)
                .get("/pools/{pool}/export", this::export)
                .post("/imports", this::startImport)
                .post("/previews", this::preview)
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
        List<String> display = display(pool);
        ArrayNode rows = Json.array();
        for (RecordRow r : db.records().page(pool.id(), offset, limit)) {
            rows.add(recordJson(r, display));
        }
        ObjectNode body = Json.object().put("offset", offset).put("limit", limit).put("total", pool.recordCount());
        body.set("records", rows);
        Responses.ok(ex, body);
    }

    /** The display columns of the pool's records, in their stored order. */
    static List<String> display(PoolRow pool) {
        return Json.read(pool.columnRolesJson(), ColumnRoles.class).display();
    }

    /** The place of record {@code record} in the pool; 404 when the pool has no such record. */
    static long rowOf(Database db, PoolRow pool, String record) {
        return db.records().rowOf(pool.id(), record).orElseThrow(() ->
                new ApiException(404, "no record '" + record + "' in pool '" + pool.name() + "'"));
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

    /** The first records of a file and suggested column roles, for the mapping step before an import. */
    private void preview(HttpServerExchange ex) throws IOException {
        String fileName = query(ex, "file_name", "upload");
        String formatWord = query(ex, "format", null);
        FileFormat format = formatWord == null ? FileFormat.fromFileName(fileName) : FileFormat.parse(formatWord);
        ex.startBlocking();
        byte[] head = ex.getInputStream().readNBytes(MAX_PREVIEW_BYTES);
        Preview p = Preview.of(new java.io.ByteArrayInputStream(head), format, Preview.DEFAULT_ROWS);
        ObjectNode body = Json.object().put("format", format.word());
        ArrayNode columns = body.putArray("columns");
        for (int c = 0; c < p.columns().size(); c++) {
            columns.addObject().put("name", p.columns().get(c)).put("numeric", p.numeric().get(c));
        }
        body.set("rows", Json.mapper().valueToTree(p.rows()));
        body.set("suggested", Json.mapper().valueToTree(p.suggested()));
        Responses.ok(ex, body);
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
}
