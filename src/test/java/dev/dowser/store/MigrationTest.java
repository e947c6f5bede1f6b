package dev.dowser.store;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import java.io.IOException;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.h2.jdbcx.JdbcDataSource;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Every migration applies to an empty database and to one left by the migrations before it. */
class MigrationTest {

    private static final Pattern VERSION = Pattern.compile("V(\\d+)__.*\\.sql");

    @TempDir
    Path dir;

    static List<Integer> versions() throws IOException, URISyntaxException {
        Path folder = Path.of(MigrationTest.class.getClassLoader().getResource("migrations").toURI());
        List<Integer> out = new ArrayList<>();
        try (Stream<Path> files = Files.list(folder)) {
            files.forEach(f -> {
                Matcher m = VERSION.matcher(f.getFileName().toString());
                if (m.matches()) {
                    out.add(Integer.parseInt(m.group(1)));
                }
            });
        }
        out.sort(null);
        return out;
    }

    private static JdbcDataSource dataSource(Path folder) {
        JdbcDataSource ds = new JdbcDataSource();
        ds.setURL("jdbc:h2:file:" + folder.toAbsolutePath().resolve(Database.FILE_STEM) + ";DB_CLOSE_DELAY=0");
        ds.setUser("dowser");
        return ds;
    }

    private static List<String> applied(JdbcDataSource ds) throws SQLException {
        List<String> out = new ArrayList<>();
        try (Connection c = ds.getConnection();
             ResultSet rs = c.createStatement().executeQuery(
                     "SELECT \"version\" FROM \"flyway_schema_history\" WHERE \"success\" AND \"version\" IS NOT NULL ORDER BY \"installed_rank\"")) {
            while (rs.next()) {
                out.add(rs.getString(1));
            }
        }
        return out;
    }

    @Test
    void theMigrationsAreNumberedWithoutGaps() throws Exception {
        List<Integer> v = versions();
        assertFalse(v.isEmpty());
        for (int i = 0; i < v.size(); i++) {
            assertEquals(i + 1, v.get(i), "migration versions must run 1, 2, 3...");
        }
    }

    @Test
    void applyToAnEmptyDatabase() throws Exception {
        try (Database db = TestSupport.openDb(dir)) {
            assertTrue(db.pools().list().isEmpty());
        }
        List<String> expected = versions().stream().map(String::valueOf).toList();
        assertEquals(expected, applied(dataSource(dir)));
    }

    @Test
    void applyOnTopOfEachEarlierSet() throws Exception {
        for (int v : versions()) {
            Path folder = dir.resolve("from-" + (v - 1));
            JdbcDataSource ds = dataSource(folder);
            if (v > 1) {
                Database.migrate(ds, String.valueOf(v - 1));
                assertEquals(v - 1, applied(ds).size());
            }
            try (Database db = TestSupport.openDb(folder)) {
                TestSupport.importText(db, "after", "a,b\n1,x\n", TestSupport.csv("after").withLabel("b"));
                assertEquals(1, db.pools().require("after").recordCount());
            }
            assertEquals(versions().size(), applied(ds).size());
        }
    }

    @Test
    void reopeningKeepsEverything() throws Exception {
        try (Database db = TestSupport.openDb(dir)) {
            TestSupport.importText(db, "p", "a,b\n1,x\n2,y\n", TestSupport.csv("p").withLabel("b"));
        }
        try (Database db = TestSupport.openDb(dir)) {
            assertEquals(2, db.pools().require("p").recordCount());
            assertEquals(2L, db.pools().list().get(0).labelledCount());
        }
    }

    /**
     * Settings kept in the code's old camelCase names (pools, rounds, history) read in the API's names
     * after the renaming migration; rounds' SettingsJsonTest reads the renamed document.
     */
    @Test
    void settingsKeptInTheOldNamesAreRenamed() throws Exception {
        String old = "{\"batchSize\":4,\"spotCheckShare\":0.2,\"leaseMinutes\":15,\"strategy\":\"bald\","
                + "\"doubleLabelShare\":0.0,\"stopAgreement\":0.95,\"coldStart\":\"typiclust\",\"chains\":2,"
                + "\"draws\":8,\"reburnInSteps\":50,\"temperature\":0.5}";
        String renamed = "{\"batch_size\":4,\"spot_check_share\":0.2,\"lease_minutes\":15,\"strategy\":\"bald\","
                + "\"double_label_share\":0.0,\"stop_agreement\":0.95,\"cold_start\":\"typiclust\",\"chains\":2,"
                + "\"draws\":8,\"reburn_in_steps\":50,\"temperature\":0.5}";
        JdbcDataSource ds = dataSource(dir);
        Database.migrate(ds, String.valueOf(version("settings_in_api_names") - 1));
        try (Connection c = ds.getConnection()) {
            c.createStatement().execute("INSERT INTO pools (id, name, label_set, column_roles, feature_schema, settings,"
                    + " record_count, created_at) VALUES (1, 'old', '[]', '{}', '{}', '" + old + "', 0, CURRENT_TIMESTAMP)");
            c.createStatement().execute("INSERT INTO rounds (pool_id, round_no, status, started_at, labels_at_start,"
                    + " seed, settings) VALUES (1, 1, 'published', CURRENT_TIMESTAMP, 0, 7, '" + old + "')");
            c.createStatement().execute("INSERT INTO history (pool_id, subject, change_kind, actor, changed_at,"
                    + " before_value, after_value) VALUES (1, 'settings', 'settings-changed', 'lead', CURRENT_TIMESTAMP,"
                    + " '" + old + "', '" + old + "')");
        }
        try (Database db = TestSupport.openDb(dir)) {
            assertEquals(renamed, db.pools().require("old").settingsJson());
            assertEquals(renamed, db.rounds().inputs(1L, 1).orElseThrow().settingsJson());
            HistoryStore.Change change = db.history().of(1L, "settings").get(0);
            assertEquals(renamed, change.before());
            assertEquals(renamed, change.after());
        }
    }

    private static int version(String description) throws IOException, URISyntaxException {
        Path folder = Path.of(MigrationTest.class.getClassLoader().getResource("migrations").toURI());
        try (Stream<Path> files = Files.list(folder)) {
            return files.map(f -> VERSION.matcher(f.getFileName().toString()))
                    .filter(m -> m.matches() && m.group(0).contains(description))
                    .mapToInt(m -> Integer.parseInt(m.group(1))).findFirst().orElseThrow();
        }
    }
}
