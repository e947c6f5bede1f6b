package dev.dowser.data;

import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.json.Json;
import dev.dowser.labels.Resolution;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import dev.dowser.store.QueueEntry;
import dev.dowser.words.Worded;
import java.io.BufferedWriter;
import java.io.IOException;
import java.io.OutputStream;
import java.io.OutputStreamWriter;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.regex.Pattern;

/**
 * Writes a pool's labelled records with their provenance: id, display fields, the final label, how
 * it was resolved (single, agreed, reviewed, unresolved) and by whom, when, the note, every
 * person's own label (person to label), and where the record came from: the round whose queue
 * first held it, whether it was a spot check, the class the model then found most probable and the
 * probability it then gave the final label. Unresolved records are written with no final label.
 * CSV (RFC 4180) or JSON Lines with the same flat field names, so an export imports back with
 * {@code --id id --label label}; JSON Lines writes numbers as numbers, lists of numbers as arrays,
 * flags as true or false and each person's label as an object.
 *
 * <p>A CSV file is often opened in a spreadsheet, which runs a cell starting with {@code =}, {@code +},
 * {@code -}, {@code @}, a tab or a carriage return as a formula: a display value can carry one (CSV
 * injection, OWASP). By default such a field is written with a {@code '} in front, which spreadsheets
 * show as text; plain numbers such as {@code -3.5} are left as they are, since a spreadsheet reads
 * them as numbers. {@link Formulas#KEEP} writes every field exactly. JSON Lines is never changed.
 */
public final class Exporter {

    public static final String ID = "id";
    public static final String LABEL = "label";
    public static final String LABELLED_BY = "labelled_by";
    public static final String LABELLED_AT = "labelled_at";
    public static final String NOTE = "note";
    public static final String RESOLUTION = "resolution";
    public static final String LABELS = "labels_by_person";
    public static final String ROUND = "round";
    public static final String SPOT_CHECK = "spot_check";
    public static final String MODEL_LABEL = "model_label";
    public static final String MODEL_PROBABILITY = "model_probability";
    /** Prefix given to a display column whose name is one of the export's own. */
    public static final String RENAMED_PREFIX = "field.";
    static final List<String> OWN_TAIL = List.of(LABEL, RESOLUTION, LABELLED_BY, LABELLED_AT, NOTE, LABELS, ROUND,
            SPOT_CHECK, MODEL_LABEL, MODEL_PROBABILITY);
    private static final Set<String> OWN = Set.copyOf(concat(List.of(ID), OWN_TAIL));
    /** JSON's own number syntax (RFC 8259, section 6): such text is written as a number, anything else as text. */
    private static final Pattern JSON_NUMBER = Pattern.compile("-?(0|[1-9][0-9]*)(\\.[0-9]+)?([eE][+-]?[0-9]+)?");

    /** How a cell is written in JSON Lines; CSV writes every cell as text. */
    enum Kind { TEXT, NUMBER, RAW }
    /** What a spreadsheet reads as a number: such a field is data, not a formula, whatever its first character. */
    private static final Pattern PLAIN_NUMBER = Pattern.compile("[+-]?(\\d+\\.?\\d*|\\.\\d+)([eE][+-]?\\d+)?");

    /** What to do with CSV fields a spreadsheet would run as formulas. */
    public enum Formulas implements Worded {
        /** Write them with a {@code '} in front, so that a spreadsheet shows them as text (the default). */
        ESCAPE,
        /** Write every field exactly as stored. */
        KEEP;

        /** {@code escape} or {@code keep}, as the command line and the API spell them. */
        public static Formulas parse(String word) {
            return Worded.parse(Formulas.class, word, "formulas choice");
        }
    }

    private final Database db;

    public Exporter(Database db) {
        this.db = db;
    }

    /** Writes every labelled record of {@code poolName}, formula-like CSV fields escaped; returns how many. */
    public long export(String poolName, FileFormat format, OutputStream out) {
        return export(poolName, format, Formulas.ESCAPE, out);
    }

    /** Writes every labelled record of {@code poolName}; returns how many. */
    public long export(String poolName, FileFormat format, Formulas formulas, OutputStream out) {
        return open(poolName, format, formulas).writeTo(out);
    }

    /**
     * An export of one pool, ready to write: the pool is found (or refused) before any byte is
     * written, so a server can still answer an unknown pool with an error.
     */
    public final class Export {

        private final PoolRow pool;
        private final FileFormat format;
        private final Formulas formulas;

        private Export(PoolRow pool, FileFormat format, Formulas formulas) {
            this.pool = pool;
            this.format = format;
            this.formulas = formulas;
        }

        /** The file name a download suggests: {@code POOL-labels.csv} or {@code .jsonl}. */
        public String fileName() {
            return pool.name() + "-labels." + format.word();
        }

        public FileFormat format() {
            return format;
        }

        /** Writes every labelled record; returns how many. */
        public long writeTo(OutputStream out) {
            return write(pool, format, formulas, out);
        }
    }

    /** The export of {@code poolName}; an unknown pool is refused here. */
    public Export open(String poolName, FileFormat format, Formulas formulas) {
        return new Export(db.pools().require(poolName), format, formulas);
    }

    private long write(PoolRow pool, FileFormat format, Formulas formulas, OutputStream out) {
        ColumnRoles roles = ColumnRoles.parse(pool.columnRolesJson());
        List<String> header = header(roles.display());
        Map<Long, QueueEntry> queued = db.queues().firstQueued(pool.id());
        Writer w = new BufferedWriter(new OutputStreamWriter(out, StandardCharsets.UTF_8), 1 << 16);
        long[] count = {0};
        try {
            if (format == FileFormat.CSV) {
                writeCsvRow(w, header, formulas);
            }
            List<String> cells = new ArrayList<>(header.size());
            List<Kind> kinds = new ArrayList<>(header.size());
            db.records().forEachLabelled(pool.id(), (r, resolution) -> {
                cells.clear();
                kinds.clear();
                add(cells, kinds, r.key(), Kind.TEXT);
                for (String v : r.display()) {
                    add(cells, kinds, v, kindOf(v));
                }
                add(cells, kinds, r.label(), Kind.TEXT);
                add(cells, kinds, resolution.status().word(), Kind.TEXT);
                add(cells, kinds, r.labelledBy(), Kind.TEXT);
                add(cells, kinds, (r.labelled() ? r.labelledAt() : resolution.lastAt()).toString(), Kind.TEXT);
                add(cells, kinds, r.labelled() ? r.note() : resolution.notes(), Kind.TEXT);
                add(cells, kinds, byPerson(resolution), Kind.RAW);
                QueueEntry e = queued.get(r.row());
                add(cells, kinds, e == null ? null : Integer.toString(e.round()), Kind.NUMBER);
                add(cells, kinds, e == null ? null : Boolean.toString(e.spotCheck()), Kind.RAW);
                QueuedBelief b = e == null || e.predictionJson() == null ? null : QueuedBelief.parse(e.predictionJson());
                boolean known = b != null && b.mean().length == pool.classes().size();
                add(cells, kinds, known ? pool.classes().get(b.top()) : null, Kind.TEXT);
                int labelAt = r.labelled() ? pool.classes().indexOf(r.label()) : -1;
                add(cells, kinds, known && labelAt >= 0 ? probability(b.mean()[labelAt]) : null, Kind.NUMBER);
                try {
                    if (format == FileFormat.CSV) {
                        writeCsvRow(w, cells, formulas);
                    } else {
                        writeJsonLine(w, header, cells, kinds);
                    }
                } catch (IOException ex) {
                    throw new UncheckedIOException(ex);
                }
                count[0]++;
            });
            w.flush();
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write the export: " + e.getMessage(), e);
        }
        return count[0];
    }

    /** The export's fields in order: the id, the display columns (renamed where they clash), then our own. */
    static List<String> header(List<String> display) {
        List<String> h = new ArrayList<>();
        h.add(ID);
        for (String d : display) {
            h.add(OWN.contains(d) || d.startsWith(RENAMED_PREFIX) ? RENAMED_PREFIX + d : d);
        }
        h.addAll(OWN_TAIL);
        return h;
    }

    private static void add(List<String> cells, List<Kind> kinds, String value, Kind kind) {
        cells.add(value);
        kinds.add(kind);
    }

    /** A probability to four decimals, enough to read and to sort by. */
    private static String probability(double p) {
        return Double.toString(Math.round(p * 10_000) / 10_000.0);
    }

    /** A display value in JSON Lines: a number as a number, a list of numbers as an array, else text. */
    static Kind kindOf(String v) {
        if (v == null) {
            return Kind.TEXT;
        }
        if (JSON_NUMBER.matcher(v).matches()) {
            return Kind.NUMBER;
        }
        String t = v.strip();
        if (t.length() > 2 && t.charAt(0) == '[' && t.charAt(t.length() - 1) == ']') {
            for (String part : t.substring(1, t.length() - 1).split(",", -1)) {
                if (!JSON_NUMBER.matcher(part.strip()).matches()) {
                    return Kind.TEXT;
                }
            }
            return Kind.RAW;
        }
        return Kind.TEXT;
    }

    /** Each person's own label as a JSON object, in the order they were given. */
    static String byPerson(Resolution resolution) {
        ObjectNode o = Json.object();
        for (Resolution.Opinion op : resolution.opinions()) {
            o.put(op.person(), op.label());
        }
        return Json.write(o);
    }

    // RFC 4180: a field with a comma, quote or line break is quoted and its quotes doubled. We also
    // quote leading or trailing spaces so that no reader trims them away.
    static void writeCsvRow(Writer w, List<String> cells, Formulas formulas) throws IOException {
        for (int i = 0; i < cells.size(); i++) {
            if (i > 0) {
                w.write(',');
            }
            String c = cells.get(i);
            if (c == null) {
                continue;
            }
            if (formulas == Formulas.ESCAPE && runsAsFormula(c)) {
                c = "'" + c;
            }
            boolean quote = c.isEmpty() ? false : c.charAt(0) == ' ' || c.charAt(c.length() - 1) == ' ';
            for (int k = 0; k < c.length() && !quote; k++) {
                char ch = c.charAt(k);
                quote = ch == ',' || ch == '"' || ch == '\n' || ch == '\r';
            }
            if (quote) {
                w.write('"');
                w.write(c.replace("\"", "\"\""));
                w.write('"');
            } else {
                w.write(c);
            }
        }
        w.write("\r\n");
    }

    /** True when a spreadsheet would take the field for a formula: it starts with = + - @ tab or CR and is no plain number. */
    static boolean runsAsFormula(String field) {
        if (field.isEmpty()) {
            return false;
        }
        char first = field.charAt(0);
        boolean trigger = first == '=' || first == '+' || first == '-' || first == '@' || first == '\t' || first == '\r';
        return trigger && !PLAIN_NUMBER.matcher(field).matches();
    }

    private static void writeJsonLine(Writer w, List<String> header, List<String> cells, List<Kind> kinds)
            throws IOException {
        StringBuilder s = new StringBuilder(256).append('{');
        for (int i = 0; i < header.size(); i++) {
            if (i > 0) {
                s.append(',');
            }
            Json.appendString(s, header.get(i));
            s.append(':');
            String c = cells.get(i);
            if (c == null) {
                s.append("null");
            } else if (kinds.get(i) == Kind.TEXT) {
                Json.appendString(s, c);
            } else {
                s.append(kinds.get(i) == Kind.RAW ? c.strip() : c);
            }
        }
        w.write(s.append("}\n").toString());
    }

    private static List<String> concat(List<String> a, List<String> b) {
        List<String> out = new ArrayList<>(a);
        out.addAll(b);
        return out;
    }

    /**
     * What an export holds besides its records: the pool, its classes with their desk keys and counts,
     * and the meaning of each field, as one JSON document.
     */
    public ObjectNode metadata(String poolName) {
        PoolDescription pool = PoolDescription.of(db, poolName);
        ColumnRoles roles = pool.roles();
        ObjectNode n = Json.object().put("pool", pool.name()).put("records", pool.records())
                .put("exported_at", db.clock().instant().toString());
        var classes = n.putArray("classes");
        for (PoolDescription.LabelClass c : pool.classes()) {
            classes.addObject().put("name", c.name()).put("key", c.key()).put("labelled", c.labelled());
        }
        ObjectNode fields = n.putObject("fields");
        List<String> header = header(roles.display());
        for (int i = 0; i < roles.display().size(); i++) {
            fields.put(header.get(i + 1), "display column '" + roles.display().get(i) + "' of the imported file");
        }
        fields.put(ID, "the record's id" + (roles.id() == null ? " (its line in the imported file)"
                : " (column '" + roles.id() + "' of the imported file)"));
        fields.put(LABEL, "the final label; empty while people disagree and no reviewer has decided");
        fields.put(RESOLUTION, "single, agreed, reviewed or unresolved");
        fields.put(LABELLED_BY, "who decided: the labeller, both labellers joined by ' & ', or the reviewer");
        fields.put(LABELLED_AT, "when, in UTC (ISO 8601)");
        fields.put(NOTE, "the reviewer's reason, or the labellers' notes");
        fields.put(LABELS, "each person's own label, person to label");
        fields.put(ROUND, "the round whose queue first held the record; empty for labels given outside a queue");
        fields.put(SPOT_CHECK, "whether the record was a spot check, picked at random to measure accuracy");
        fields.put(MODEL_LABEL, "the class the model found most probable when the record was queued");
        fields.put(MODEL_PROBABILITY, "the probability the model then gave the final label (mean over the"
                + " posterior draws)");
        return n;
    }
}
