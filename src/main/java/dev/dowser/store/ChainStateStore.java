package dev.dowser.store;

import dev.dowser.json.Json;
import java.io.ByteArrayInputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Timestamp;
import java.sql.Types;
import java.time.Clock;
import java.util.ArrayList;
import java.util.List;
import javax.sql.DataSource;

/**
 * Saves and loads the chains' last states, all of a pool's chains together, per round: the latest
 * two rounds' states are kept, so the round before the latest can be continued (or rebuilt) again.
 */
public final class ChainStateStore {

    private final DataSource ds;
    private final Clock clock;

    ChainStateStore(DataSource ds, Clock clock) {
        this.ds = ds;
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
        try {
            Transactions.run(ds, c -> {
                try (PreparedStatement del = c.prepareStatement("DELETE FROM chain_states WHERE pool_id = ?"
                        + " AND (round_no = ? OR round_no < (SELECT MIN(r) FROM (SELECT DISTINCT round_no AS r"
                        + " FROM chain_states WHERE pool_id = ? AND round_no <> ? ORDER BY r DESC FETCH FIRST "
                        + (KEPT_ROUNDS - 1) + " ROWS ONLY) AS latest))");
                     PreparedStatement ins = c.prepareStatement("INSERT INTO chain_states (pool_id, chain_no, round_no,"
                             + " kernel, network, position, kernel_state, hyper, step_size, step_count, saved_at)"
                             + " VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)")) {
                    del.setLong(1, poolId);
                    del.setInt(2, round);
                    del.setLong(3, poolId);
                    del.setInt(4, round);
                    del.executeUpdate();
                    Timestamp now = Timestamp.from(clock.instant());
                    for (SavedChain s : chains) {
                        ins.setLong(1, poolId);
                        ins.setInt(2, s.chain());
                        ins.setInt(3, s.round());
                        ins.setString(4, s.kernel());
                        ins.setString(5, s.networkJson());
                        byte[] position = toBytes(s.position());
                        ins.setBinaryStream(6, new ByteArrayInputStream(position), position.length);
                        if (s.kernelState() == null) {
                            ins.setNull(7, Types.BLOB);
                        } else {
                            ins.setBinaryStream(7, new ByteArrayInputStream(s.kernelState()), s.kernelState().length);
                        }
                        ins.setString(8, s.hyper() == null ? null : Json.write(s.hyper()));
                        ins.setDouble(9, s.stepSize());
                        ins.setLong(10, s.step());
                        ins.setTimestamp(11, now);
                        ins.executeUpdate();
                    }
                }
                return null;
            });
        } catch (SQLException e) {
            throw new StoreException("cannot save the chains of pool " + poolId + ": " + e.getMessage(), e);
        }
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
        List<SavedChain> out = new ArrayList<>();
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT chain_no, round_no, kernel, network, position,"
                     + " kernel_state, hyper, step_size, step_count FROM chain_states"
                     + " WHERE pool_id = ? AND round_no = " + roundSql + " ORDER BY chain_no")) {
            q.setLong(1, poolId);
            q.setLong(2, roundParameter);
            try (ResultSet rs = q.executeQuery()) {
                while (rs.next()) {
                    String hyper = rs.getString(7);
                    out.add(new SavedChain(rs.getInt(1), rs.getInt(2), rs.getString(3), rs.getString(4),
                            toFloats(rs.getBytes(5)), rs.getBytes(6),
                            hyper == null ? null : Json.read(hyper, double[].class), rs.getDouble(8), rs.getLong(9)));
                }
            }
        } catch (SQLException e) {
            throw new StoreException("cannot load the chains of pool " + poolId + ": " + e.getMessage(), e);
        }
        return out;
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
