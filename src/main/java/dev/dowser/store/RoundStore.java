package dev.dowser.store;

import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Clock;
import java.time.Instant;
import java.util.List;
import java.util.Optional;

/** The record of rounds: when each ran, how it ended, with which kernel, and the chains' health. */
public final class RoundStore {

    /** One round as stored. */
    public record RoundRow(int round, RoundStatus status, Instant startedAt, Instant finishedAt, long labelsAtStart,
                           String kernel, String message, String healthJson, String samplerJson) {
    }

    /**
     * What a round was computed from, kept so that its queue can be rebuilt.
     *
     * @param seed         the round's node of the pool's seed tree
     * @param samplerJson  the sampler's configuration
     * @param settingsJson the pool's settings
     * @param lastLabelId  the newest label row the round read (0 when there were none)
     * @param chainsFrom   the round whose chain states it continued; null when they started afresh
     */
    public record Inputs(long seed, String samplerJson, String settingsJson, long lastLabelId, Integer chainsFrom) {
    }

    /** Why a round found running at start is marked interrupted. */
    public static final String INTERRUPTED_WHY = "the server stopped without warning during this round (killed or"
            + " crashed); nothing of it was kept, and the next round continues from the chains saved before it";

    private final Sql sql;
    private final Clock clock;

    RoundStore(Sql sql, Clock clock) {
        this.sql = sql;
        this.clock = clock;
    }

    /** The number the pool's next round will have (1, 2, ...), unless another starts first. */
    public int next(long poolId) {
        return sql.first("read the rounds of pool " + poolId, "SELECT COALESCE(MAX(round_no), 0) FROM rounds"
                + " WHERE pool_id = ?", rs -> rs.getInt(1), poolId).orElse(0) + 1;
    }

    /**
     * Records the start of round {@code round} of the pool with what it is computed from; refused
     * when that number is taken (another round started first).
     */
    public void start(long poolId, int round, long labels, Inputs inputs) {
        sql.update("start round " + round + " of pool " + poolId, "INSERT INTO rounds (pool_id, round_no, status,"
                + " started_at, labels_at_start, seed, sampler, settings, last_label_id, chains_from)"
                + " VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)", poolId, round, RoundStatus.RUNNING.word(), clock.instant(),
                labels, inputs.seed(), inputs.samplerJson(), inputs.settingsJson(), inputs.lastLabelId(),
                inputs.chainsFrom());
    }

    /** What round {@code round} of the pool was computed from; empty for rounds stored before this was kept. */
    public Optional<Inputs> inputs(long poolId, int round) {
        return sql.first("read round " + round + " of pool " + poolId, "SELECT seed, sampler, settings, last_label_id,"
                + " chains_from FROM rounds WHERE pool_id = ? AND round_no = ? AND seed IS NOT NULL",
                // chains_from read by itself: wasNull() speaks of the last column read.
                rs -> new Inputs(rs.getLong(1), rs.getString(2), rs.getString(3), rs.getLong(4), Sql.nullableInt(rs, 5)),
                poolId, round);
    }

    public void finish(long poolId, int round, String kernel, String message, String healthJson) {
        end(poolId, round, RoundStatus.PUBLISHED, kernel, message, healthJson);
    }

    public void fail(long poolId, int round, String message) {
        end(poolId, round, RoundStatus.FAILED, null, message, null);
    }

    /** The round was stopped at a safe point (the server shut down); its chains were saved, its queue not published. */
    public void stop(long poolId, int round, String kernel, String message) {
        end(poolId, round, RoundStatus.STOPPED, kernel, message, null);
    }

    private void end(long poolId, int round, RoundStatus status, String kernel, String message, String healthJson) {
        sql.update("record the end of round " + round, "UPDATE rounds SET status = ?, finished_at = ?, kernel = ?,"
                + " message = ?, health = ? WHERE pool_id = ? AND round_no = ?", status.word(), clock.instant(), kernel,
                message, healthJson, poolId, round);
    }

    /**
     * Marks every round still recorded as running, in every pool, as interrupted: called once as
     * the server starts, when no round of this server can be running. Returns how many there were.
     */
    public int interruptRunning() {
        return sql.update("mark interrupted rounds", "UPDATE rounds SET status = ?, finished_at = ?, message = ?"
                + " WHERE status = ?", RoundStatus.INTERRUPTED.word(), clock.instant(), INTERRUPTED_WHY,
                RoundStatus.RUNNING.word());
    }

    /**
     * What a round told about whether more labels pay (see {@code Settling} in the rounds).
     *
     * @param candidates     the unlabelled records it picked from
     * @param agreement      Cohen's kappa of its stop-set predictions with the round before's (NaN: nothing to compare)
     * @param compared       the stop-set records compared
     * @param information    BALD summed over every candidate (nats)
     * @param informationTop BALD summed over the batch's best candidates (nats)
     */
    public record Settled(long candidates, double agreement, int compared, double information, double informationTop) {
    }

    /** A published round with a model, as the accuracy and stopping advice read it. */
    public record Evidence(int round, long labelsAtStart, Settled settled, String samplerJson, String healthJson) {
    }

    /** Keeps what round {@code round} told about whether more labels pay. */
    public void settled(long poolId, int round, Settled s) {
        sql.update("record what round " + round + " told", "UPDATE rounds SET candidates = ?, agreement = ?,"
                + " agreement_records = ?, information = ?, information_top = ? WHERE pool_id = ? AND round_no = ?",
                s.candidates(), Double.isNaN(s.agreement()) ? null : s.agreement(), s.compared(), s.information(),
                s.informationTop(), poolId, round);
    }

    /** The pool's published rounds that had a model and kept what they told, oldest first. */
    public List<Evidence> evidence(long poolId) {
        return sql.list("read the rounds of pool " + poolId, "SELECT round_no, labels_at_start, candidates, agreement,"
                + " agreement_records, information, information_top, sampler, health FROM rounds"
                + " WHERE pool_id = ? AND status = ? AND candidates IS NOT NULL ORDER BY round_no",
                rs -> {
                    Double agreement = Sql.nullableDouble(rs, 4);
                    return new Evidence(rs.getInt(1), rs.getLong(2), new Settled(rs.getLong(3),
                            agreement == null ? Double.NaN : agreement, rs.getInt(5), rs.getDouble(6), rs.getDouble(7)),
                            rs.getString(8), rs.getString(9));
                }, poolId, RoundStatus.PUBLISHED.word());
    }

    /** The pool's rounds, newest first. */
    public List<RoundRow> list(long poolId) {
        return sql.list("list the rounds of pool " + poolId, "SELECT " + ROW_COLUMNS
                + " FROM rounds WHERE pool_id = ? ORDER BY round_no DESC", RoundStore::row, poolId);
    }

    /** The pool's newest round, if it has had one. */
    public Optional<RoundRow> latest(long poolId) {
        return sql.first("read the rounds of pool " + poolId, "SELECT " + ROW_COLUMNS
                + " FROM rounds WHERE pool_id = ? ORDER BY round_no DESC", RoundStore::row, poolId);
    }

    private static final String ROW_COLUMNS = "round_no, status, started_at, finished_at, labels_at_start, kernel,"
            + " message, health, sampler";

    private static RoundRow row(ResultSet rs) throws SQLException {
        return new RoundRow(rs.getInt(1), RoundStatus.parse(rs.getString(2)), Sql.instant(rs, 3), Sql.instant(rs, 4),
                rs.getLong(5), rs.getString(6), rs.getString(7), rs.getString(8), rs.getString(9));
    }
}
