package dev.dowser.data;

import java.util.ArrayList;
import java.util.Collection;
import java.util.Comparator;
import java.util.List;

/** Orders a label set read from a file: numerically when every label is a number, else by text. */
final class LabelOrder {

    private LabelOrder() {
    }

    static List<String> sorted(Collection<String> labels) {
        List<String> out = new ArrayList<>(labels);
        boolean numeric = out.stream().allMatch(NumberText::looksNumeric);
        out.sort(numeric ? Comparator.comparingDouble(NumberText::parse) : Comparator.naturalOrder());
        return out;
    }
}
