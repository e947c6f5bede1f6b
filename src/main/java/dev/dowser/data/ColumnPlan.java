package dev.dowser.data;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

/** The column roles of a spec resolved against a file's header: names checked, defaults filled in. */
record ColumnPlan(ColumnRoles roles, int idIndex, int labelIndex, int[] featureIndex, int[] displayIndex) {

    static ColumnPlan resolve(List<String> header, ImportSpec spec) {
        // Names are looked up in a map, once each: a file may have tens of thousands of columns.
        Map<String, Integer> at = new HashMap<>(header.size() * 2);
        for (int i = 0; i < header.size(); i++) {
            at.putIfAbsent(header.get(i), i);
        }
        int id = spec.idColumn() == null ? -1 : indexOf(header, at, spec.idColumn(), "id");
        int label = spec.labelColumn() == null ? -1 : indexOf(header, at, spec.labelColumn(), "label");
        if (id >= 0 && id == label) {
            throw ImportException.of("column '" + spec.idColumn() + "' cannot be both the id and the label column");
        }
        List<String> features = new ArrayList<>();
        if (spec.featureColumns().isEmpty()) {
            features.addAll(allBut(header, id, label));
        } else {
            for (String f : distinct(spec.featureColumns(), "feature")) {
                int c = indexOf(header, at, f, "feature");
                if (c == id || c == label) {
                    throw ImportException.of("column '" + f + "' is the " + (c == id ? "id" : "label")
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
                indexOf(header, at, d, "display");
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
        return new ColumnPlan(roles, id, label, indices(at, features), indices(at, display));
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

    private static int indexOf(List<String> header, Map<String, Integer> at, String name, String role) {
        Integer i = at.get(name);
        if (i == null) {
            String columns = header.size() <= 50 ? String.join(", ", header)
                    : String.join(", ", header.subList(0, 50)) + " and " + (header.size() - 50) + " more";
            throw ImportException.of("the " + role + " column '" + name + "' is not in the file; its columns are: "
                    + columns);
        }
        return i;
    }

    private static int[] indices(Map<String, Integer> at, List<String> names) {
        int[] out = new int[names.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = at.get(names.get(i));
        }
        return out;
    }
}
