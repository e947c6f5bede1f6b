package dev.dowser.cli;

import dev.dowser.data.LabelledFiles;
import dev.dowser.data.LabelledSet;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import picocli.CommandLine.Mixin;

/**
 * The labelled file the offline commands ({@code fit}, {@code simulate}) work on, read with the
 * import's options and encoding but into memory, without a database.
 */
final class LabelledFile {

    @Mixin
    ColumnOptions columns;

    /** Every labelled record of the file, standardised as the model sees them. */
    LabelledSet read() throws IOException {
        if (columns.label == null) {
            throw new IllegalArgumentException("name the column that holds the labels with --label COL");
        }
        columns.checkFile();
        try (InputStream in = Files.newInputStream(columns.file)) {
            return LabelledFiles.read(in, columns.spec("offline", "file"));
        }
    }

    String fileName() {
        return columns.file.getFileName().toString();
    }
}
