package dev.dowser.data;

import dev.dowser.words.Worded;
import java.util.Locale;

/** The file formats Dowser reads and writes. */
public enum FileFormat implements Worded {
    /** RFC 4180 comma-separated values with a header row, UTF-8, with or without a byte order mark. */
    CSV("csv"),
    /** One JSON object per line, UTF-8. */
    JSONL("jsonl");

    private final String word;

    FileFormat(String word) {
        this.word = word;
    }

    @Override
    public String word() {
        return word;
    }

    /** Parses the format's word as given on a command line or in a request. */
    public static FileFormat parse(String word) {
        return Worded.parse(FileFormat.class, word, "format");
    }

    /** Guesses the format from a file name: {@code .jsonl}, {@code .ndjson} or {@code .json} mean JSON Lines. */
    public static FileFormat fromFileName(String name) {
        String lower = name.toLowerCase(Locale.ROOT);
        if (lower.endsWith(".jsonl") || lower.endsWith(".ndjson") || lower.endsWith(".json")) {
            return JSONL;
        }
        return CSV;
    }
}
