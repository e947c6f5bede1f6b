package dev.dowser.cli;

import dev.dowser.store.Database;
import java.nio.file.Path;
import java.time.Clock;
import picocli.CommandLine.Option;
import picocli.CommandLine.ScopeType;

/** The {@code --data} option shared by every command that opens the database. */
final class DataOption {

    static final String DEFAULT_DIR = "dowser-data";

    @Option(names = "--data", paramLabel = "DIR", defaultValue = DEFAULT_DIR, scope = ScopeType.INHERIT,
            description = "Folder of the database (default: ${DEFAULT-VALUE}).")
    Path dir;

    Database open() {
        return Database.open(dir, Clock.systemUTC());
    }
}
