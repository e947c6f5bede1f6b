package dev.dowser.store;

import dev.dowser.json.Json;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.time.Clock;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;

/**
 * Saves and loads the chains' last states, all of a pool's chains together, per round: the latest
 * two rounds' states are kept, so the round before the latest can be continued (or rebuilt) again.
 */
public final class ChainStateStore {

    private final Sql sql;
    private final Clock clock;

    ChainStateStore(Sql sql, Clock clock) {
        this.sql = sql;
        this.clock = clock;
    }

    /** Rounds whose chain states are kept for each pool. */
    static final int KEPT_ROUNDS = 2;

    /**
     * Saves the pool's chains as they stood after a round (all with the same round number),
     * replacing any saved for that round and dropping those older than the latest two rounds, in
     * one transaction.
     */
    public void save(long poolId, List<SavedChain> chains) {
        if (chains.isEmpty() || chains.stream().anyMatch(s -> s.round() != chains.get(0).round())) {
            throw new IllegalArgumentException("save the chains of one round together");
        }
        int round = chains.get(0).round();
        Instant now = clock.instant();
        List<Object[]> rows = new ArrayList<>(chains.size());
        for (SavedChain s : chains) {
            rows.add(new Object[] {poolId, s.chain(), s.round(), s.kernel(), s.networkJson(), toBytes(s.position()),
                s.kernelState(), s.hyper() == null ? null : Json.write(s.hyper()), s.stepSize(), s.step(), now});
        }
        sql.transaction("save the chains of pool " + poolId, c -> {
            Sql.update(c, "DELETE FROM chain_states WHERE pool_id = ? AND (round_no = ? OR round_no < (SELECT MIN(r)"
                    + " FROM (SELECT DISTINCT round_no AS r FROM chain_states WHERE pool_id = ? AND round_no <> ?"
                    + " ORDER BY r DESC FETCH FIRST " + (KEPT_ROUNDS - 1) + " ROWS ONLY) AS latest))",
                    poolId, round, poolId, round);
            Sql.batch(c, "INSERT INTO chain_states (pool_id, chain_no, round_no, kernel, network, position,"
                    + " kernel_state, hyper, step_size, step_count, saved_at)"
                    + " VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)", rows);
            return null;
        });
    }

    /** The pool's chains as the latest round left them, in chain order; empty when none were saved. */
    public List<SavedChain> load(long poolId) {
        return load(poolId, "(SELECT MAX(round_no) FROM chain_states WHERE pool_id = ?)", poolId);
    }

    /** The pool's chains as round {@code round} left them; empty when they are not kept. */
    public List<SavedChain> load(long poolId, int round) {
        return load(poolId, "?", round);
    }

    private List<SavedChain> load(long poolId, String roundSql, long roundParameter) {
        return sql.list("load the chains of pool " + poolId, "SELECT chain_no, round_no, kernel, network, position,"
                + " kernel_state, hyper, step_size, step_count FROM chain_states"
                + " WHERE pool_id = ? AND round_no = " + roundSql + " ORDER BY chain_no", rs -> {
                    String hyper = rs.getString(7);
                    return new SavedChain(rs.getInt(1), rs.getInt(2), rs.getString(3), rs.getString(4),
                            toFloats(rs.getBytes(5)), rs.getBytes(6),
                            hyper == null ? null : Json.read(hyper, double[].class), rs.getDouble(8), rs.getLong(9));
                }, poolId, roundParameter);
    }

    static byte[] toBytes(float[] v) {
        ByteBuffer b = ByteBuffer.allocate(4 * v.length).order(ByteOrder.LITTLE_ENDIAN);
        b.asFloatBuffer().put(v);
        return b.array();
    }

    static float[] toFloats(byte[] bytes) {
        float[] v = new float[bytes.length / 4];
        ByteBuffer.wrap(bytes).order(ByteOrder.LITTLE_ENDIAN).asFloatBuffer().get(v);
        return v;
    }
}
