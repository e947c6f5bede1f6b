package dev.dowser.store;

import com.zaxxer.hikari.HikariConfig;
import com.zaxxer.hikari.HikariDataSource;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import javax.sql.DataSource;
import org.flywaydb.core.Flyway;

/**
 * The embedded H2 file database of one data folder, or a team's PostgreSQL server: a connection
 * pool in front of it and the schema brought up to date by Flyway from {@code migrations/} on the
 * class path. Nothing else in the project creates or alters tables.
 */
public final class Database implements AutoCloseable {

    /** File name stem of the database inside the data folder. */
    public static final String FILE_STEM = "dowser";
    /** Where the migration scripts are packaged inside the jar. */
    public static final String MIGRATIONS = "classpath:migrations";
    static final int DEFAULT_POOL_SIZE = 8;
    /** How long a statement on PostgreSQL waits for a lock before it is busy: H2's default lock timeout. */
    static final int LOCK_TIMEOUT_SECONDS = 10;

    private final HikariDataSource dataSource;
    private final Clock clock;
    private final PoolStore pools;
    private final RecordStore records;
    private final LabelStore labels;
    private final ChainStateStore chains;
    private final QueueStore queues;
    private final LeaseStore leases;
    private final RoundStore rounds;
    private final UserStore users;
    private final HistoryStore history;
    private final PredictionStore predictions;

    private Database(HikariDataSource dataSource, Clock clock) {
        this.dataSource = dataSource;
        this.clock = clock;
        Sql sql = new Sql(dataSource);
        this.labels = new LabelStore(sql, clock);
        this.pools = new PoolStore(sql, labels, clock);
        this.records = new RecordStore(sql, labels);
        this.chains = new ChainStateStore(sql, clock);
        this.queues = new QueueStore(sql, clock);
        this.leases = new LeaseStore(sql, clock, queues);
        this.rounds = new RoundStore(sql, clock);
        this.users = new UserStore(sql, clock);
        this.history = new HistoryStore(sql, clock);
        this.predictions = new PredictionStore(sql);
    }

    /** When a committed transaction reaches the database file. */
    public enum Commits {
        /**
         * Before the commit returns, so that a write the server acknowledged survives the process
         * being killed. What every database that people work on uses.
         */
        WRITTEN,
        /**
         * Up to 500 ms later, in the background (H2's own default): for scratch databases that are
         * thrown away, and to measure what {@link #WRITTEN} costs ({@code dowser bench --only desk}).
         */
        DELAYED
    }

    /** True when {@code dataDir} holds a database; looking writes nothing. */
    public static boolean exists(Path dataDir) {
        return Files.isRegularFile(dataDir.resolve(FILE_STEM + ".mv.db"));
    }

    /** Opens (creating if needed) the database in {@code dataDir} and applies pending migrations. */
    public static Database open(Path dataDir, Clock clock) {
        return open(dataDir, clock, Commits.WRITTEN);
    }

    /** As {@link #open(Path, Clock)}, with commits reaching the file as {@code commits} says. */
    public static Database open(Path dataDir, Clock clock, Commits commits) {
        try {
            Files.createDirectories(dataDir);
        } catch (IOException e) {
            throw new StoreException("cannot create the data folder " + dataDir + ": " + e.getMessage(), e);
        }
        HikariDataSource ds;
        try {
            ds = new HikariDataSource(config(dataDir, commits));
        } catch (RuntimeException e) {
            throw new StoreException("cannot open the database in " + dataDir + ": " + rootMessage(e)
                    + " (is another Dowser using this folder?)", e);
        }
        try {
            migrate(ds, null);
        } catch (RuntimeException e) {
            ds.close();
            throw new StoreException("cannot bring the database in " + dataDir + " up to date: " + rootMessage(e), e);
        }
        return new Database(ds, clock);
    }

    /**
     * Opens the PostgreSQL database at {@code jdbcUrl} ({@code jdbc:postgresql://host:port/name}), a
     * team's shared server, and applies pending migrations: the same scripts as on H2, read as
     * PostgreSQL spells their types ({@link Migrations}).
     */
    public static Database connect(String jdbcUrl, String user, String password, Clock clock) {
        if (jdbcUrl == null || !jdbcUrl.startsWith("jdbc:postgresql:")) {
            throw new IllegalArgumentException("a shared database is a PostgreSQL one: give its address as"
                    + " jdbc:postgresql://host:port/name, not " + jdbcUrl);
        }
        HikariConfig config = new HikariConfig();
        config.setJdbcUrl(jdbcUrl);
        config.setUsername(user);
        config.setPassword(password);
        config.setMaximumPoolSize(DEFAULT_POOL_SIZE);
        config.setPoolName("dowser-postgresql");
        // PostgreSQL waits for a lock without limit by default; H2 gives up after its lock timeout, and
        // the store reports that as busy (55P03 here), so that a person is answered "try again".
        // Acknowledged means durable: a commit returns only once PostgreSQL has flushed it to its log,
        // whatever the server's or the database's default (synchronous_commit = off would lose the last
        // acknowledged labels if PostgreSQL itself crashed).
        config.setConnectionInitSql("SET lock_timeout = '" + LOCK_TIMEOUT_SECONDS + "s'; SET synchronous_commit = on");
        config.setAutoCommit(true);
        HikariDataSource ds;
        try {
            ds = new HikariDataSource(config);
        } catch (RuntimeException e) {
            throw new StoreException("cannot connect to the database at " + jdbcUrl + ": " + rootMessage(e), e);
        }
        try {
            Flyway.configure().dataSource(ds).resourceProvider(Migrations.forPostgresql()).load().migrate();
        } catch (RuntimeException e) {
            ds.close();
            throw new StoreException("cannot bring the database at " + jdbcUrl + " up to date: " + rootMessage(e), e);
        }
        return new Database(ds, clock);
    }

    private static String rootMessage(Throwable e) {
        Throwable t = e;
        while (t.getCause() != null && t.getCause() != t) {
            t = t.getCause();
        }
        return t.getMessage();
    }

    /** Applies migrations up to {@code target} (all when null); used by tests of the upgrade path. */
    static void migrate(DataSource ds, String target) {
        var configuration = Flyway.configure()
                .dataSource(ds)
                .locations(MIGRATIONS)
                .failOnMissingLocations(true);
        if (target != null) {
            configuration.target(target);
        }
        configuration.load().migrate();
    }

    static HikariConfig config(Path dataDir, Commits commits) {
        HikariConfig config = new HikariConfig();
        // DB_CLOSE_ON_EXIT=FALSE: we close the pool ourselves on shutdown, after the last write.
        // WRITE_DELAY=0: each commit is written to the file before it returns, so a write the server
        // acknowledged survives the process being killed (by default H2 holds commits in memory for up
        // to 500 ms). It must be in the URL, which is read when the database opens; a SET WRITE_DELAY
        // on one connection later was measured not to help (issue 11). The file is not forced to the
        // disk on each commit (H2 has no such setting), so a power cut can still lose the last writes.
        config.setJdbcUrl("jdbc:h2:file:" + dataDir.toAbsolutePath().resolve(FILE_STEM)
                + ";DB_CLOSE_ON_EXIT=FALSE;MAX_COMPACT_TIME=2000"
                + (commits == Commits.WRITTEN ? ";WRITE_DELAY=0" : ""));
        config.setUsername("dowser");
        config.setPassword("");
        config.setMaximumPoolSize(DEFAULT_POOL_SIZE);
        config.setPoolName("dowser-h2");
        config.setAutoCommit(true);
        return config;
    }

    public PoolStore pools() {
        return pools;
    }

    public RecordStore records() {
        return records;
    }

    public LabelStore labels() {
        return labels;
    }

    public ChainStateStore chains() {
        return chains;
    }

    public QueueStore queues() {
        return queues;
    }

    public LeaseStore leases() {
        return leases;
    }

    public RoundStore rounds() {
        return rounds;
    }

    public UserStore users() {
        return users;
    }

    public HistoryStore history() {
        return history;
    }

    public PredictionStore predictions() {
        return predictions;
    }

    /**
     * Starts the all-or-nothing write of a new pool whose records have {@code columns} fields, those
     * at {@code displayIndex} shown to people; see {@link PoolWriter}. {@code checkKeys} is false
     * when record ids are unique by construction; carried-in labels are attributed to
     * {@code importedBy}.
     */
    public PoolWriter newPool(String name, int columns, int[] displayIndex, boolean checkKeys, String importedBy) {
        return PoolWriter.begin(dataSource, clock, name, columns, displayIndex, checkKeys, importedBy);
    }

    public Clock clock() {
        return clock;
    }

    DataSource dataSource() {
        return dataSource;
    }

    @Override
    public void close() {
        dataSource.close();
    }
}
