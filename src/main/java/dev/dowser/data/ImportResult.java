package dev.dowser.data;

import java.util.List;

/** What an import stored. */
public record ImportResult(String poolName, long records, long labelled, List<String> classes, int features,
                           long bytes, double seconds) {

    public ImportResult {
        classes = List.copyOf(classes);
    }

    public double recordsPerSecond() {
        return seconds > 0 ? records / seconds : 0;
    }
}
