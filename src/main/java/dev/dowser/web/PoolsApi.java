package dev.dowser.web;

import static dev.dowser.web.Requests.longQuery;
import static dev.dowser.web.Requests.param;
import static dev.dowser.web.Requests.query;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.data.Exporter;
import dev.dowser.data.FeatureColumn;
import dev.dowser.data.FeatureKind;
import dev.dowser.data.FileFormat;
import dev.dowser.data.PoolDescription;
import dev.dowser.desk.Overview;
import dev.dowser.json.Json;
import dev.dowser.store.Database;
import dev.dowser.store.PoolSummary;
import io.undertow.server.HttpServerExchange;
import io.undertow.util.Headers;

/** The pools: the list, one pool's classes, columns and features, its records page by page, and its export. */
final class PoolsApi {

    private final Database db;
    private final Overview overview;
    private final Exporter exporter;

    PoolsApi(Database db, Overview overview) {
        this.db = db;
        this.overview = overview;
        this.exporter = new Exporter(db);
    }

    void listPools(HttpServerExchange ex) {
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

    void pool(HttpServerExchange ex) {
        PoolDescription pool = PoolDescription.of(db, param(ex, "pool"));
        ObjectNode body = Json.object()
                .put("name", pool.name())
                .put("records", pool.records())
                .put("created_at", pool.createdAt().toString());
        ArrayNode classes = body.putArray("classes");
        for (PoolDescription.LabelClass c : pool.classes()) {
            classes.addObject().put("name", c.name()).put("key", c.key()).put("labelled", c.labelled());
        }
        body.set("roles", Json.mapper().valueToTree(pool.roles()));
        ArrayNode features = body.putArray("features");
        for (FeatureColumn c : pool.schema().columns()) {
            ObjectNode f = features.addObject().put("name", c.name()).put("kind", c.kind().word())
                    .put("width", c.encodedWidth()).put("missing", c.missing());
            if (c.kind() == FeatureKind.CATEGORICAL) {
                f.set("levels", Json.mapper().valueToTree(c.levels()));
            } else {
                f.set("mean", Json.mapper().valueToTree(c.mean()));
                f.set("sd", Json.mapper().valueToTree(c.sd()));
                f.put("low", c.low()).put("high", c.high());
            }
        }
        body.put("feature_width", pool.schema().encodedWidth());
        Responses.ok(ex, body);
    }

    void records(HttpServerExchange ex) {
        Overview.RecordsPage page = overview.records(param(ex, "pool"), longQuery(ex, "offset", 0),
                (int) longQuery(ex, "limit", Requests.DEFAULT_PAGE));
        ArrayNode rows = Json.array();
        page.records().forEach(r -> rows.add(Views.record(r)));
        ObjectNode body = Json.object().put("offset", page.offset()).put("limit", page.limit())
                .put("total", page.total());
        body.set("records", rows);
        Responses.ok(ex, body);
    }

    /** The export's metadata: the pool, its classes with their keys and counts, and what each field means. */
    void exportMetadata(HttpServerExchange ex) {
        Responses.ok(ex, exporter.metadata(param(ex, "pool")));
    }

    void export(HttpServerExchange ex) {
        Exporter.Export export = exporter.open(param(ex, "pool"), FileFormat.parse(query(ex, "format", "csv")),
                Exporter.Formulas.parse(query(ex, "formulas", "escape")));
        ex.startBlocking();
        ex.getResponseHeaders().put(Headers.CONTENT_TYPE, export.format() == FileFormat.CSV
                ? "text/csv; charset=utf-8" : "application/x-ndjson; charset=utf-8");
        ex.getResponseHeaders().put(Headers.CONTENT_DISPOSITION, "attachment; filename=\"" + export.fileName() + "\"");
        // Labels and the people who gave them: no copy kept by browsers or proxies.
        ex.getResponseHeaders().put(Headers.CACHE_CONTROL, "no-store");
        export.writeTo(ex.getOutputStream());
    }
}
