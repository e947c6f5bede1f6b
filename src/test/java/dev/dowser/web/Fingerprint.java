package dev.dowser.web;

import dev.dowser.store.Database;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

/**
 * What a refused request must leave exactly as it was, read through one connection of its own: the
 * rows in each table a request writes, and the fields of accounts, tokens, sessions and pool settings
 * a request changes in place. The tables of rounds are left out: rounds run on their own.
 */
final class Fingerprint implements AutoCloseable {

    static final List<String> COUNTED = List.of("pools", "record_blocks", "imports", "labels", "users", "sessions",
            "api_tokens", "history");
    static final Map<String, String> READ = Map.of(
            "users", "SELECT name || '|' || role || '|' || disabled || '|' || password_hash FROM users ORDER BY id",
            "api_tokens", "SELECT id || '|' || COALESCE(CAST(revoked_at AS VARCHAR), '') FROM api_tokens ORDER BY id",
            "sessions", "SELECT token_hash || '|' || COALESCE(CAST(ended_at AS VARCHAR), '') FROM sessions ORDER BY token_hash",
            "pools", "SELECT name || '|' || settings FROM pools ORDER BY id");

    private final Connection c;

    Fingerprint(Path dataDir) {
        try {
            c = DriverManager.getConnection("jdbc:h2:file:" + dataDir.toAbsolutePath().resolve(Database.FILE_STEM),
                    "dowser", "");
        } catch (SQLException e) {
            throw new IllegalStateException(e);
        }
    }

    Map<String, String> take() {
        Map<String, String> out = new TreeMap<>();
        try (Statement s = c.createStatement()) {
            for (String t : COUNTED) {
                try (ResultSet rs = s.executeQuery("SELECT COUNT(*) FROM " + t)) {
                    rs.next();
                    out.put("count:" + t, Long.toString(rs.getLong(1)));
                }
            }
            for (var e : READ.entrySet()) {
                StringBuilder all = new StringBuilder();
                try (ResultSet rs = s.executeQuery(e.getValue())) {
                    while (rs.next()) {
                        all.append(rs.getString(1)).append('\n');
                    }
                }
                out.put("rows:" + e.getKey(), all.toString());
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
