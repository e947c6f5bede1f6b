package dev.dowser.data;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;

/** The column roles of a spec resolved against a file's header: names checked, defaults filled in. */
record ColumnPlan(ColumnRoles roles, int idIndex, int labelIndex, int[] featureIndex, int[] displayIndex) {

    static ColumnPlan resolve(List<String> header, ImportSpec spec) {
        int id = spec.idColumn() == null ? -1 : indexOf(header, spec.idColumn(), "id");
        int label = spec.labelColumn() == null ? -1 : indexOf(header, spec.labelColumn(), "label");
        if (id >= 0 && id == label) {
            throw ImportException.of("column '" + spec.idColumn() + "' cannot be both the id and the label column");
        }
        List<String> features = new ArrayList<>();
        if (spec.featureColumns().isEmpty()) {
            features.addAll(allBut(header, id, label));
        } else {
            for (String f : distinct(spec.featureColumns(), "feature")) {
                int at = indexOf(header, f, "feature");
                if (at == id || at == label) {
                    throw ImportException.of("column '" + f + "' is the " + (at == id ? "id" : "label")
                            + " column and cannot also be a feature");
                }
                features.add(f);
            }
        }
        if (features.isEmpty()) {
            throw ImportException.of("no feature columns are left; the model needs at least one");
        }
        List<String> display = new ArrayList<>();
        if (spec.displayColumns().isEmpty()) {
            display.addAll(allBut(header, id, label));
        } else {
            for (String d : distinct(spec.displayColumns(), "display")) {
                indexOf(header, d, "display");
                display.add(d);
            }
        }
        Set<String> featureSet = new HashSet<>(features);
        for (String c : spec.categorical()) {
            if (!featureSet.contains(c)) {
                throw ImportException.of("categorical column '" + c + "' is not one of the feature columns");
            }
        }
        ColumnRoles roles = new ColumnRoles(spec.idColumn(), features, display, spec.labelColumn(),
                spec.categorical());
        return new ColumnPlan(roles, id, label, indices(header, features), indices(header, display));
    }

    /** Every column of the header except those at the two indices (-1 for none). */
    private static List<String> allBut(List<String> header, int id, int label) {
        List<String> out = new ArrayList<>();
        for (int i = 0; i < header.size(); i++) {
            if (i != id && i != label) {
                out.add(header.get(i));
            }
        }
        return out;
    }

    private static List<String> distinct(List<String> names, String role) {
        Set<String> seen = new LinkedHashSet<>();
        for (String n : names) {
            if (!seen.add(n)) {
                throw ImportException.of("the " + role + " columns name '" + n + "' twice");
            }
        }
        return new ArrayList<>(seen);
    }

    private static int indexOf(List<String> header, String name, String role) {
        int at = header.indexOf(name);
        if (at < 0) {
            throw ImportException.of("the " + role + " column '" + name + "' is not in the file; its columns are: "
                    + String.join(", ", header));
        }
        return at;
    }

    private static int[] indices(List<String> header, List<String> names) {
        int[] out = new int[names.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = header.indexOf(names.get(i));
        }
        return out;
    }
}
