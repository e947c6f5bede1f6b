package dev.dowser.store;

import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Clock;
import java.time.Instant;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * Accounts, their browser sessions and their API tokens. Tokens are looked up by hash only. Every
 * change to an account is written with its history entries in one transaction: a change the server
 * acknowledged is there with its history, whatever happens to the process afterwards.
 */
public final class UserStore {

    private static final String USER_COLUMNS = "u.id, u.name, u.role, u.password_hash, u.disabled, u.created_at";

    /**
     * One change to an account, with what it entails; a null field stays as it is. A new password
     * ends the account's sessions but {@code keepSession} (null: all of them) and is recorded as
     * {@code passwordKind}; {@code revokeTokens} revokes every live API token.
     */
    public record AccountChange(String role, Boolean disabled, String passwordHash, String passwordKind,
                                String keepSession, boolean revokeTokens) {
        public AccountChange {
            if (passwordHash != null && passwordKind == null) {
                throw new IllegalArgumentException("a new password needs the kind of change to record");
            }
        }
    }

    private final Sql sql;
    private final Clock clock;

    UserStore(Sql sql, Clock clock) {
        this.sql = sql;
        this.clock = clock;
    }

    /** Adds an account and its history entry ({@code actor} added it), both or neither. */
    public UserRow add(String name, String role, String passwordHash, String actor) {
        Instant now = clock.instant();
        try {
            return sql.transaction("add the account '" + name + "'", c -> {
                long id = Sql.insert(c, "INSERT INTO users (name, role, password_hash, created_at) VALUES (?, ?, ?, ?)",
                        "id", name, role, passwordHash, now);
                HistoryStore.append(c, clock, null, subject(name), "account-added", actor, null, role);
                return new UserRow(id, name, role, passwordHash, false, now);
            });
        } catch (StoreException e) {
            if (e.getCause() instanceof SQLException s && s.getSQLState() != null && s.getSQLState().startsWith("23")) {
                throw new ConflictException("there is already an account named '" + name + "'");
            }
            throw e;
        }
    }

    /**
     * Changes an account in {@code actor}'s name and appends each part of the change to its history,
     * in one transaction; returns the account as it is now.
     */
    public UserRow change(String name, AccountChange change, String actor) {
        return sql.transaction("change the account '" + name + "'", c -> {
            UserRow before = Sql.first(c, "SELECT " + USER_COLUMNS + " FROM users u WHERE u.name = ? FOR UPDATE",
                    rs -> user(rs, 1), name).orElseThrow(() -> new NotFoundException("no account named '" + name + "'"));
            String subject = subject(name);
            if (change.role() != null) {
                Sql.update(c, "UPDATE users SET role = ? WHERE id = ?", change.role(), before.id());
                HistoryStore.append(c, clock, null, subject, "role-changed", actor, before.role(), change.role());
            }
            if (change.disabled() != null) {
                Sql.update(c, "UPDATE users SET disabled = ? WHERE id = ?", change.disabled(), before.id());
                HistoryStore.append(c, clock, null, subject, change.disabled() ? "account-disabled" : "account-enabled",
                        actor, Boolean.toString(before.disabled()), Boolean.toString(change.disabled()));
            }
            if (change.passwordHash() != null) {
                Sql.update(c, "UPDATE users SET password_hash = ? WHERE id = ?", change.passwordHash(), before.id());
                Sql.update(c, "UPDATE sessions SET ended_at = ? WHERE user_id = ? AND ended_at IS NULL"
                        + " AND token_hash <> COALESCE(?, '')", clock.instant(), before.id(), change.keepSession());
                HistoryStore.append(c, clock, null, subject, change.passwordKind(), actor, null, null);
            }
            if (change.revokeTokens()) {
                int revoked = Sql.update(c, "UPDATE api_tokens SET revoked_at = ? WHERE user_id = ?"
                        + " AND revoked_at IS NULL", clock.instant(), before.id());
                if (revoked > 0) {
                    HistoryStore.append(c, clock, null, subject, "tokens-revoked", actor, revoked + " live", "0 live");
                }
            }
            return Sql.first(c, "SELECT " + USER_COLUMNS + " FROM users u WHERE u.id = ?", rs -> user(rs, 1),
                    before.id()).orElseThrow();
        });
    }

    /** Stores a stronger hash of the same password (at sign-in): not a change anyone made, so no history. */
    public void rehash(String name, String passwordHash) {
        sql.update("store the new password hash of '" + name + "'", "UPDATE users SET password_hash = ? WHERE name = ?",
                passwordHash, name);
    }

    public long count() {
        return sql.first("count accounts", "SELECT COUNT(*) FROM users", rs -> rs.getLong(1)).orElse(0L);
    }

    public List<UserRow> list() {
        return sql.list("list accounts", "SELECT " + USER_COLUMNS + " FROM users u ORDER BY u.name", rs -> user(rs, 1));
    }

    public Optional<UserRow> find(String name) {
        return sql.first("read the account '" + name + "'", "SELECT " + USER_COLUMNS + " FROM users u WHERE u.name = ?",
                rs -> user(rs, 1), name);
    }

    public UserRow require(String name) {
        return find(name).orElseThrow(() -> new NotFoundException("no account named '" + name + "'"));
    }

    public void addSession(String tokenHash, long userId, String csrfToken) {
        Instant now = clock.instant();
        sql.update("start a session", "INSERT INTO sessions (token_hash, user_id, csrf_token, created_at, last_seen_at)"
                + " VALUES (?, ?, ?, ?, ?)", tokenHash, userId, csrfToken, now, now);
    }

    public Optional<SessionRow> session(String tokenHash) {
        return sql.first("read a session", "SELECT " + USER_COLUMNS + ", s.csrf_token, s.created_at, s.last_seen_at,"
                + " s.ended_at FROM sessions s JOIN users u ON u.id = s.user_id WHERE s.token_hash = ?",
                rs -> new SessionRow(tokenHash, user(rs, 1), rs.getString(7), Sql.instant(rs, 8), Sql.instant(rs, 9),
                        Sql.instant(rs, 10)), tokenHash);
    }

    public void touchSession(String tokenHash) {
        sql.update("renew a session", "UPDATE sessions SET last_seen_at = ? WHERE token_hash = ?", clock.instant(),
                tokenHash);
    }

    public void endSession(String tokenHash) {
        sql.update("end a session", "UPDATE sessions SET ended_at = ? WHERE token_hash = ? AND ended_at IS NULL",
                clock.instant(), tokenHash);
    }

    public void addToken(String tokenHash, long userId, String name) {
        sql.update("store an API token", "INSERT INTO api_tokens (token_hash, user_id, name, created_at)"
                + " VALUES (?, ?, ?, ?)", tokenHash, userId, name, clock.instant());
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
        sql.list("count API tokens", "SELECT u.name, COUNT(*) FROM api_tokens t JOIN users u ON u.id = t.user_id"
                + " WHERE t.revoked_at IS NULL GROUP BY u.name", rs -> out.put(rs.getString(1), rs.getLong(2)));
        return out;
    }

    /**
     * Revokes token {@code id} of {@code userName}; false when that account has no such live token.
     * When {@code actor} is someone else (an admin), the account's history says so, in the same transaction.
     */
    public boolean revokeToken(long id, String userName, String actor) {
        return sql.transaction("revoke an API token", c -> {
            boolean revoked = Sql.update(c, "UPDATE api_tokens SET revoked_at = ? WHERE id = ? AND revoked_at IS NULL"
                    + " AND user_id = (SELECT id FROM users WHERE name = ?)", clock.instant(), id, userName) == 1;
            if (revoked && !userName.equals(actor)) {
                HistoryStore.append(c, clock, null, subject(userName), "token-revoked", actor, "token " + id, null);
            }
            return revoked;
        });
    }

    private List<TokenRow> tokens(String where, String value) {
        return sql.list("read API tokens", "SELECT " + USER_COLUMNS + ", t.id, t.name, t.created_at, t.revoked_at"
                + " FROM api_tokens t JOIN users u ON u.id = t.user_id WHERE " + where + " ORDER BY t.id",
                rs -> new TokenRow(rs.getLong(7), user(rs, 1), rs.getString(8), Sql.instant(rs, 9), Sql.instant(rs, 10)),
                value);
    }

    /** The history's subject for an account. */
    private static String subject(String name) {
        return "account:" + name;
    }

    private static UserRow user(ResultSet rs, int at) throws SQLException {
        return new UserRow(rs.getLong(at), rs.getString(at + 1), rs.getString(at + 2), rs.getString(at + 3),
                rs.getBoolean(at + 4), Sql.instant(rs, at + 5));
    }
}
