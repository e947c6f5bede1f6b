package dev.dowser.store;

import java.sql.Connection;
import java.sql.SQLException;
import javax.sql.DataSource;

/** Runs a piece of work on one connection as one transaction: committed if it returns, rolled back if it throws. */
final class Transactions {

    /** The work, given the connection it must use. */
    @FunctionalInterface
    interface Work<T> {
        T run(Connection c) throws SQLException;
    }

    private Transactions() {
    }

    static <T> T run(DataSource ds, Work<T> work) throws SQLException {
        try (Connection c = ds.getConnection()) {
            c.setAutoCommit(false);
            try {
                T result = work.run(c);
                c.commit();
                return result;
            } catch (SQLException | RuntimeException e) {
                c.rollback();
                throw e;
            } finally {
                c.setAutoCommit(true);
            }
        }
    }
}
