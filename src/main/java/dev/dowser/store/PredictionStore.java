package dev.dowser.store;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.util.HashMap;
import java.util.Map;
import javax.sql.DataSource;

/**
 * The model's posterior predictive for each labelled record after the latest round: derived data,
 * replaced whole by each round, read by the review page to find records where a confident model
 * disagrees with the people.
 */
public final class PredictionStore {

    private final DataSource ds;

    PredictionStore(DataSource ds) {
        this.ds = ds;
    }

    /** Replaces the pool's predictions with those of {@code round}: {@code json[i]} is row {@code rows[i]}'s. */
    public void replace(long poolId, int round, long[] rows, String[] json) {
        try {
            Transactions.run(ds, c -> {
                try (PreparedStatement del = c.prepareStatement("DELETE FROM labelled_predictions WHERE pool_id = ?");
                     PreparedStatement ins = c.prepareStatement("INSERT INTO labelled_predictions"
                             + " (pool_id, row_no, round_no, probabilities) VALUES (?, ?, ?, ?)")) {
                    del.setLong(1, poolId);
                    del.executeUpdate();
                    for (int i = 0; i < rows.length; i++) {
                        ins.setLong(1, poolId);
                        ins.setLong(2, rows[i]);
                        ins.setInt(3, round);
                        ins.setString(4, json[i]);
                        ins.addBatch();
                    }
                    ins.executeBatch();
                }
                return null;
            });
        } catch (SQLException e) {
            throw new StoreException("cannot store the predictions of round " + round + ": " + e.getMessage(), e);
        }
    }

    /** Row to its predictive probabilities (a JSON array in class order). */
    public Map<Long, String> all(long poolId) {
        Map<Long, String> out = new HashMap<>();
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT row_no, probabilities FROM labelled_predictions"
                     + " WHERE pool_id = ?")) {
            q.setLong(1, poolId);
            try (ResultSet rs = q.executeQuery()) {
                while (rs.next()) {
                    out.put(rs.getLong(1), rs.getString(2));
                }
            }
            return out;
        } catch (SQLException e) {
            throw new StoreException("cannot read the predictions of pool " + poolId + ": " + e.getMessage(), e);
        }
    }
}
