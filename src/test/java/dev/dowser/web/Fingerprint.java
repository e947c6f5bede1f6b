package dev.dowser.web;

import dev.dowser.store.Database;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.Collection;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

/**
 * What a refused request must leave exactly as it was, read through one connection of its own: the
 * rows in each table a request writes, and the fields of accounts, tokens, sessions and pool settings
 * a request changes in place. The fields are summed as hashes in the database (H2's ORA_HASH), so
 * that a fingerprint costs little however many pools the fuzz campaign has made. The tables of
 * rounds are left out: rounds run on their own.
 */
final class Fingerprint implements AutoCloseable {

    static final List<String> COUNTED = List.of("pools", "record_blocks", "imports", "labels", "users", "sessions",
            "api_tokens", "history");
    static final Map<String, String> FIELDS = Map.of(
            "users", "name || '|' || role || '|' || disabled || '|' || password_hash",
            "api_tokens", "id || '|' || COALESCE(CAST(revoked_at AS VARCHAR), '')",
            "sessions", "token_hash || '|' || COALESCE(CAST(ended_at AS VARCHAR), '')",
            "pools", "name || '|' || settings");
    /** The tables an import writes (PoolWriter): a refused import must leave them as they were. */
    static final List<String> IMPORT_WRITES = List.of("pools", "record_blocks", "imports", "labels");

    private final Connection c;

    Fingerprint(Path dataDir) {
        try {
            c = DriverManager.getConnection("jdbc:h2:file:" + dataDir.toAbsolutePath().resolve(Database.FILE_STEM),
                    "dowser", "");
        } catch (SQLException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Everything a request may change. */
    Map<String, String> take() {
        return take(COUNTED, FIELDS.keySet());
    }

    /** What an import may change: the rows of its tables, and the pools' settings. */
    Map<String, String> takeImportTables() {
        return take(IMPORT_WRITES, List.of("pools"));
    }

    private Map<String, String> take(Collection<String> counted, Collection<String> read) {
        Map<String, String> out = new TreeMap<>();
        try (Statement s = c.createStatement()) {
            for (String t : counted) {
                try (ResultSet rs = s.executeQuery("SELECT COUNT(*) FROM " + t)) {
                    rs.next();
                    out.put("count:" + t, Long.toString(rs.getLong(1)));
                }
            }
            for (String t : read) {
                try (ResultSet rs = s.executeQuery("SELECT COALESCE(SUM(ORA_HASH(" + FIELDS.get(t) + ")), 0), COUNT(*) FROM "
                        + t)) {
                    rs.next();
                    out.put("rows:" + t, rs.getString(1) + "/" + rs.getLong(2));
                }
            }
        } catch (SQLException e) {
            throw new IllegalStateException(e);
        }
        return out;
    }

    @Override
    public void close() {
        try {
            c.close();
        } catch (SQLException ignored) {
            // The database closes with the server anyway.
        }
    }
}
