package dev.dowser.data;

import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.json.Json;
import dev.dowser.labels.Resolution;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import java.io.BufferedWriter;
import java.io.IOException;
import java.io.OutputStream;
import java.io.OutputStreamWriter;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.regex.Pattern;

/**
 * Writes a pool's labelled records with their provenance: id, display fields, the final label, how
 * it was resolved (single, agreed, reviewed, unresolved) and by whom, when, the note, and every
 * person's own label (a JSON object, person to label). Unresolved records are written with no
 * final label. CSV (RFC 4180) or JSON Lines with the same flat field names, so an export imports
 * back with {@code --id id --label label}.
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
    /** Prefix given to a display column whose name is one of the export's own. */
    public static final String RENAMED_PREFIX = "field.";
    private static final Set<String> OWN = Set.of(ID, LABEL, RESOLUTION, LABELLED_BY, LABELLED_AT, NOTE,
            LABELS);
    /** What a spreadsheet reads as a number: such a field is data, not a formula, whatever its first character. */
    private static final Pattern PLAIN_NUMBER = Pattern.compile("[+-]?(\\d+\\.?\\d*|\\.\\d+)([eE][+-]?\\d+)?");

    /** What to do with CSV fields a spreadsheet would run as formulas. */
    public enum Formulas {
        /** Write them with a {@code '} in front, so that a spreadsheet shows them as text (the default). */
        ESCAPE,
        /** Write every field exactly as stored. */
        KEEP;

        /** {@code escape} or {@code keep}, as the command line and the API spell them. */
        public static Formulas parse(String word) {
            for (Formulas f : values()) {
                if (f.name().equalsIgnoreCase(word)) {
                    return f;
                }
            }
            throw new IllegalArgumentException("formulas must be escape or keep, got '" + word + "'");
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
        PoolRow pool = db.pools().require(poolName);
        ColumnRoles roles = ColumnRoles.parse(pool.columnRolesJson());
        List<String> header = header(roles.display());
        Writer w = new BufferedWriter(new OutputStreamWriter(out, StandardCharsets.UTF_8), 1 << 16);
        long[] count = {0};
        try {
            if (format == FileFormat.CSV) {
                writeCsvRow(w, header, formulas);
            }
            List<String> cells = new ArrayList<>(header.size());
            db.records().forEachLabelled(pool.id(), (r, resolution) -> {
                cells.clear();
                cells.add(r.key());
                cells.addAll(r.display());
                cells.add(r.label());
                cells.add(resolution.status());
                cells.add(r.labelledBy());
                cells.add((r.labelled() ? r.labelledAt() : resolution.lastAt()).toString());
                cells.add(r.labelled() ? r.note() : resolution.notes());
                cells.add(byPerson(resolution));
                try {
                    if (format == FileFormat.CSV) {
                        writeCsvRow(w, cells, formulas);
                    } else {
                        writeJsonLine(w, header, cells);
                    }
                } catch (IOException e) {
                    throw new UncheckedIOException(e);
                }
                count[0]++;
            });
            w.flush();
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write the export: " + e.getMessage(), e);
        }
        return count[0];
    }

    static List<String> header(List<String> display) {
        List<String> h = new ArrayList<>();
        h.add(ID);
        for (String d : display) {
            h.add(OWN.contains(d) || d.startsWith(RENAMED_PREFIX) ? RENAMED_PREFIX + d : d);
        }
        h.add(LABEL);
        h.add(RESOLUTION);
        h.add(LABELLED_BY);
        h.add(LABELLED_AT);
        h.add(NOTE);
        h.add(LABELS);
        return h;
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

    private static void writeJsonLine(Writer w, List<String> header, List<String> cells) throws IOException {
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
            } else {
                Json.appendString(s, c);
            }
        }
        w.write(s.append("}\n").toString());
    }
}
