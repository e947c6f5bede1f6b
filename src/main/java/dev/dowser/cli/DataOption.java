package dev.dowser.cli;

import dev.dowser.store.Database;
import java.nio.file.Path;
import java.time.Clock;
import java.util.Locale;
import picocli.CommandLine.Option;
import picocli.CommandLine.ScopeType;

/**
 * Where a command finds the store: the H2 database in the {@code --data} folder, or, with
 * {@code --database-url}, a team's PostgreSQL server. The folder holds uploads and other files in
 * both cases. Every command that opens the store takes these options from here.
 */
final class DataOption {

    static final String DEFAULT_DIR = "dowser-data";
    static final String URL_OPTION = "--database-url";
    static final String USER_OPTION = "--database-user";
    /** The password is read from here only: on the command line every user of the machine would see it in ps. */
    static final String PASSWORD_VARIABLE = "DOWSER_DATABASE_PASSWORD";
    private static final String POSTGRESQL = "jdbc:postgresql:";

    @Option(names = "--data", paramLabel = "DIR", defaultValue = DEFAULT_DIR, scope = ScopeType.INHERIT,
            description = "Folder of the database and of uploads (default: ${DEFAULT-VALUE}); with " + URL_OPTION
                    + " it holds the uploads only.")
    Path dir;

    @Option(names = URL_OPTION, paramLabel = "URL", scope = ScopeType.INHERIT,
            description = "Keep the pools, labels and accounts on a PostgreSQL server instead of the H2 file in --data:"
                    + " jdbc:postgresql://HOST:PORT/DB. The database must exist (Dowser makes its tables); the password"
                    + " is read from the environment variable " + PASSWORD_VARIABLE + ", never from the command line.")
    String url;

    @Option(names = USER_OPTION, paramLabel = "NAME", scope = ScopeType.INHERIT,
            description = "The PostgreSQL account to connect as (needed with " + URL_OPTION + ").")
    String user;

    /** True when the store is a PostgreSQL server rather than the H2 file in the folder. */
    boolean shared() {
        checked();
        return url != null;
    }

    /** "the database in DIR" or "the database at URL", for messages. */
    String where() {
        return shared() ? "the database at " + url : "the database in " + dir;
    }

    /** The options that name this store again, for a command a message suggests. */
    String asArguments() {
        if (shared()) {
            return URL_OPTION + " " + quoted(url) + " " + USER_OPTION + " " + quoted(user) + " --data " + quoted(dir.toString());
        }
        return "--data " + quoted(dir.toString());
    }

    Database open() {
        if (shared()) {
            return Database.connect(url, user, System.getenv(PASSWORD_VARIABLE), Clock.systemUTC());
        }
        return Database.open(dir, Clock.systemUTC());
    }

    private void checked() {
        if (url == null) {
            if (user != null) {
                throw new IllegalArgumentException(USER_OPTION + " is for a PostgreSQL server: give its address with "
                        + URL_OPTION + " jdbc:postgresql://HOST:PORT/DB too, or leave " + USER_OPTION
                        + " out to use the H2 database in --data");
            }
            return;
        }
        if (!url.startsWith(POSTGRESQL)) {
            throw new IllegalArgumentException(URL_OPTION + " takes a PostgreSQL address, jdbc:postgresql://HOST:PORT/DB,"
                    + " not " + url + "; change it to that form, or leave the option out to use the H2 database in --data");
        }
        if (url.toLowerCase(Locale.ROOT).contains("password=")) {
            throw new IllegalArgumentException(URL_OPTION + " must not carry the password (the process list shows"
                    + " it to everyone on this machine): take password=... out of the address and set the environment"
                    + " variable " + PASSWORD_VARIABLE + " instead");
        }
        if (user == null || user.isBlank()) {
            throw new IllegalArgumentException(URL_OPTION + " needs " + USER_OPTION
                    + " NAME, the PostgreSQL account to connect as");
        }
    }

    private static String quoted(String s) {
        return s.contains(" ") ? "'" + s + "'" : s;
    }
}
