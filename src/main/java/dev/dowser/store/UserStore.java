package dev.dowser.store;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Timestamp;
import java.time.Clock;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import javax.sql.DataSource;

/** Accounts, their browser sessions and their API tokens. Tokens are looked up by hash only. */
public final class UserStore {

    private static final String USER_COLUMNS = "u.id, u.name, u.role, u.password_hash, u.disabled, u.created_at";

    private final DataSource ds;
    private final Clock clock;

    UserStore(DataSource ds, Clock clock) {
        this.ds = ds;
        this.clock = clock;
    }

    public UserRow add(String name, String role, String passwordHash) {
        Instant now = clock.instant();
        try (Connection c = ds.getConnection();
             PreparedStatement p = c.prepareStatement("INSERT INTO users (name, role, password_hash, created_at)"
                     + " VALUES (?, ?, ?, ?)", new String[] {"id"})) {
            p.setString(1, name);
            p.setString(2, role);
            p.setString(3, passwordHash);
            p.setTimestamp(4, Timestamp.from(now));
            p.executeUpdate();
            try (ResultSet keys = p.getGeneratedKeys()) {
                keys.next();
                return new UserRow(keys.getLong(1), name, role, passwordHash, false, now);
            }
        } catch (SQLException e) {
            if (e.getSQLState() != null && e.getSQLState().startsWith("23")) {
                throw new ConflictException("there is already an account named '" + name + "'");
            }
            throw new StoreException("cannot add the account '" + name + "': " + e.getMessage(), e);
        }
    }

    public long count() {
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT COUNT(*) FROM users");
             ResultSet rs = q.executeQuery()) {
            rs.next();
            return rs.getLong(1);
        } catch (SQLException e) {
            throw new StoreException("cannot count accounts: " + e.getMessage(), e);
        }
    }

    public List<UserRow> list() {
        List<UserRow> out = new ArrayList<>();
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT " + USER_COLUMNS + " FROM users u ORDER BY u.name");
             ResultSet rs = q.executeQuery()) {
            while (rs.next()) {
                out.add(user(rs, 1));
            }
            return out;
        } catch (SQLException e) {
            throw new StoreException("cannot list accounts: " + e.getMessage(), e);
        }
    }

    public Optional<UserRow> find(String name) {
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT " + USER_COLUMNS + " FROM users u WHERE u.name = ?")) {
            q.setString(1, name);
            try (ResultSet rs = q.executeQuery()) {
                return rs.next() ? Optional.of(user(rs, 1)) : Optional.empty();
            }
        } catch (SQLException e) {
            throw new StoreException("cannot read the account '" + name + "': " + e.getMessage(), e);
        }
    }

    public UserRow require(String name) {
        return find(name).orElseThrow(() -> new NotFoundException("no account named '" + name + "'"));
    }

    /** Changes the given fields of an account; a null leaves that field as it is. */
    public void update(String name, String role, String passwordHash, Boolean disabled) {
        try (Connection c = ds.getConnection();
             PreparedStatement u = c.prepareStatement("UPDATE users SET role = COALESCE(?, role),"
                     + " password_hash = COALESCE(?, password_hash), disabled = COALESCE(?, disabled) WHERE name = ?")) {
            u.setString(1, role);
            u.setString(2, passwordHash);
            u.setObject(3, disabled);
            u.setString(4, name);
            if (u.executeUpdate() != 1) {
                throw new NotFoundException("no account named '" + name + "'");
            }
        } catch (SQLException e) {
            throw new StoreException("cannot change the account '" + name + "': " + e.getMessage(), e);
        }
    }

    public void addSession(String tokenHash, long userId, String csrfToken) {
        Timestamp now = Timestamp.from(clock.instant());
        try (Connection c = ds.getConnection();
             PreparedStatement p = c.prepareStatement("INSERT INTO sessions (token_hash, user_id, csrf_token,"
                     + " created_at, last_seen_at) VALUES (?, ?, ?, ?, ?)")) {
            p.setString(1, tokenHash);
            p.setLong(2, userId);
            p.setString(3, csrfToken);
            p.setTimestamp(4, now);
            p.setTimestamp(5, now);
            p.executeUpdate();
        } catch (SQLException e) {
            throw new StoreException("cannot start a session: " + e.getMessage(), e);
        }
    }

    public Optional<SessionRow> session(String tokenHash) {
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT " + USER_COLUMNS + ", s.csrf_token, s.created_at,"
                     + " s.last_seen_at, s.ended_at FROM sessions s JOIN users u ON u.id = s.user_id"
                     + " WHERE s.token_hash = ?")) {
            q.setString(1, tokenHash);
            try (ResultSet rs = q.executeQuery()) {
                if (!rs.next()) {
                    return Optional.empty();
                }
                return Optional.of(new SessionRow(tokenHash, user(rs, 1), rs.getString(7), instant(rs, 8),
                        instant(rs, 9), instant(rs, 10)));
            }
        } catch (SQLException e) {
            throw new StoreException("cannot read a session: " + e.getMessage(), e);
        }
    }

    public void touchSession(String tokenHash) {
        execute("UPDATE sessions SET last_seen_at = ? WHERE token_hash = ?", tokenHash, "cannot renew a session");
    }

    public void endSession(String tokenHash) {
        execute("UPDATE sessions SET ended_at = ? WHERE token_hash = ? AND ended_at IS NULL", tokenHash,
                "cannot end a session");
    }

    /** Ends every open session of the account but {@code keepHash} (which may be null: all of them). */
    public void endSessionsExcept(long userId, String keepHash) {
        try (Connection c = ds.getConnection();
             PreparedStatement u = c.prepareStatement("UPDATE sessions SET ended_at = ? WHERE user_id = ?"
                     + " AND ended_at IS NULL AND token_hash <> COALESCE(?, '')")) {
            u.setTimestamp(1, Timestamp.from(clock.instant()));
            u.setLong(2, userId);
            u.setString(3, keepHash);
            u.executeUpdate();
        } catch (SQLException e) {
            throw new StoreException("cannot end the sessions of account " + userId + ": " + e.getMessage(), e);
        }
    }

    public void addToken(String tokenHash, long userId, String name) {
        try (Connection c = ds.getConnection();
             PreparedStatement p = c.prepareStatement("INSERT INTO api_tokens (token_hash, user_id, name, created_at)"
                     + " VALUES (?, ?, ?, ?)")) {
            p.setString(1, tokenHash);
            p.setLong(2, userId);
            p.setString(3, name);
            p.setTimestamp(4, Timestamp.from(clock.instant()));
            p.executeUpdate();
        } catch (SQLException e) {
            throw new StoreException("cannot store an API token: " + e.getMessage(), e);
        }
    }

    public Optional<TokenRow> token(String tokenHash) {
        return tokens("t.token_hash = ?", tokenHash).stream().findFirst();
    }

    /** The live (not revoked) tokens of {@code userName}, oldest first. */
    public List<TokenRow> tokensOf(String userName) {
        return tokens("u.name = ? AND t.revoked_at IS NULL", userName);
    }

    /** Live tokens per account name (accounts without any are left out). */
    public Map<String, Long> liveTokenCounts() {
        Map<String, Long> out = new HashMap<>();
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT u.name, COUNT(*) FROM api_tokens t JOIN users u"
                     + " ON u.id = t.user_id WHERE t.revoked_at IS NULL GROUP BY u.name");
             ResultSet rs = q.executeQuery()) {
            while (rs.next()) {
                out.put(rs.getString(1), rs.getLong(2));
            }
            return out;
        } catch (SQLException e) {
            throw new StoreException("cannot count API tokens: " + e.getMessage(), e);
        }
    }

    /** Revokes every live token of the account; returns how many. */
    public int revokeTokensOf(long userId) {
        try (Connection c = ds.getConnection();
             PreparedStatement u = c.prepareStatement("UPDATE api_tokens SET revoked_at = ? WHERE user_id = ?"
                     + " AND revoked_at IS NULL")) {
            u.setTimestamp(1, Timestamp.from(clock.instant()));
            u.setLong(2, userId);
            return u.executeUpdate();
        } catch (SQLException e) {
            throw new StoreException("cannot revoke the API tokens of account " + userId + ": " + e.getMessage(), e);
        }
    }

    /** Revokes token {@code id} of {@code userName}; false when that account has no such live token. */
    public boolean revokeToken(long id, String userName) {
        try (Connection c = ds.getConnection();
             PreparedStatement u = c.prepareStatement("UPDATE api_tokens SET revoked_at = ? WHERE id = ?"
                     + " AND revoked_at IS NULL AND user_id = (SELECT id FROM users WHERE name = ?)")) {
            u.setTimestamp(1, Timestamp.from(clock.instant()));
            u.setLong(2, id);
            u.setString(3, userName);
            return u.executeUpdate() == 1;
        } catch (SQLException e) {
            throw new StoreException("cannot revoke an API token: " + e.getMessage(), e);
        }
    }

    private List<TokenRow> tokens(String where, String value) {
        List<TokenRow> out = new ArrayList<>();
        try (Connection c = ds.getConnection();
             PreparedStatement q = c.prepareStatement("SELECT " + USER_COLUMNS + ", t.id, t.name, t.created_at,"
                     + " t.revoked_at FROM api_tokens t JOIN users u ON u.id = t.user_id WHERE " + where
                     + " ORDER BY t.id")) {
            q.setString(1, value);
            try (ResultSet rs = q.executeQuery()) {
                while (rs.next()) {
                    out.add(new TokenRow(rs.getLong(7), user(rs, 1), rs.getString(8), instant(rs, 9), instant(rs, 10)));
                }
            }
            return out;
        } catch (SQLException e) {
            throw new StoreException("cannot read API tokens: " + e.getMessage(), e);
        }
    }

    private void execute(String sql, String tokenHash, String failure) {
        try (Connection c = ds.getConnection();
             PreparedStatement u = c.prepareStatement(sql)) {
            u.setTimestamp(1, Timestamp.from(clock.instant()));
            u.setString(2, tokenHash);
            u.executeUpdate();
        } catch (SQLException e) {
            throw new StoreException(failure + ": " + e.getMessage(), e);
        }
    }

    private static UserRow user(ResultSet rs, int at) throws SQLException {
        return new UserRow(rs.getLong(at), rs.getString(at + 1), rs.getString(at + 2), rs.getString(at + 3),
                rs.getBoolean(at + 4), instant(rs, at + 5));
    }

    private static Instant instant(ResultSet rs, int column) throws SQLException {
        Timestamp t = rs.getTimestamp(column);
        return t == null ? null : t.toInstant();
    }
}
