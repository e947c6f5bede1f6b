package dev.dowser.team;

import dev.dowser.store.ConflictException;
import dev.dowser.store.Database;
import dev.dowser.store.SessionRow;
import dev.dowser.store.TokenRow;
import dev.dowser.store.UserRow;
import dev.dowser.store.UserStore;
import java.security.SecureRandom;
import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.regex.Pattern;

/**
 * Accounts, sign-in and the checks behind every request: passwords, browser sessions (idle and
 * absolute expiry, ended server-side on logout), API tokens, and the hold on password guessing. A disabled account's sessions and tokens stop
 * working at once, because every request reads the account.
 */
public final class Accounts {

    static final Duration TOUCH_EVERY = Duration.ofMinutes(1);
    private static final Pattern NAME = Pattern.compile("[\\p{L}\\p{N}._@-][\\p{L}\\p{N}._@ -]{0,99}");

    private final Database db;
    private final Clock clock;
    private final SecureRandom random;
    private final TeamConfig config;
    private final Passwords passwords;
    private final LoginLimiter limiter;
    private volatile String decoyHash;

    public Accounts(Database db, SecureRandom random, TeamConfig config) {
        this.db = db;
        this.clock = db.clock();
        this.random = random;
        this.config = config;
        this.passwords = new Passwords(random, config.iterations());
        this.limiter = new LoginLimiter(clock, config);
    }

    /** A browser session just started: the cookie's token (shown once) and who it signs in. */
    public record SignIn(String token, Caller caller) {
    }

    /**
     * True when some enabled account is an admin. A server needs one to be managed, so {@code dowser
     * serve} refuses to start without it and says how to make one ({@code dowser users add}).
     */
    public boolean hasAdmin() {
        return db.users().list().stream().anyMatch(u -> !u.disabled() && Role.parse(u.role()) == Role.ADMIN);
    }

    public UserRow add(String name, Role role, String password, String actor) {
        checkName(name);
        return db.users().add(name, role.word(), passwords.hash(password), actor);
    }

    public UserRow require(String name) {
        return db.users().require(name);
    }

    public List<UserRow> list() {
        return db.users().list();
    }

    /**
     * An admin's change to an account: any of a new role, disabled or enabled, a new password (null
     * leaves each as it is), written with its history in one transaction. Nobody changes their own
     * role or disables themselves, so that a team never loses its last admin by a slip; another
     * admin must. Disabling the account or giving it a new password revokes its API tokens, and a new
     * password ends its sessions, as after a leak. Returns the account as it is now.
     */
    public UserRow change(String name, Role role, Boolean disabled, String password, String actor) {
        UserRow account = db.users().require(name);
        if (password != null) {
            Passwords.check(password);
        }
        if (account.name().equals(actor) && (role != null || Boolean.TRUE.equals(disabled))) {
            throw new ConflictException("you cannot change your own role or disable yourself; ask another admin");
        }
        return db.users().change(account.name(), new UserStore.AccountChange(role == null ? null : role.word(),
                disabled, password == null ? null : passwords.hash(password), "password-reset", null,
                password != null || Boolean.TRUE.equals(disabled)), actor);
    }

    public void changeRole(String name, Role role, String actor) {
        db.users().change(name, new UserStore.AccountChange(role.word(), null, null, null, null, false), actor);
    }

    /**
     * Disables or enables an account. A disabled one's sessions stop at the next request and its API
     * tokens are revoked, so that enabling it again brings back no credential made before.
     */
    public void setDisabled(String name, boolean disabled, String actor) {
        db.users().change(name, new UserStore.AccountChange(null, disabled, null, null, null, disabled), actor);
    }

    /** An admin's new password for someone: their sessions end and their API tokens are revoked, as after a leak. */
    public void resetPassword(String name, String password, String actor) {
        Passwords.check(password);
        db.users().change(name, new UserStore.AccountChange(null, null, passwords.hash(password), "password-reset",
                null, true), actor);
    }

    /**
     * A person changing their own password: the current one must be right (a wrong one counts as a
     * failed sign-in), and their other sessions end, in case the old password had leaked.
     */
    public void changeOwnPassword(Caller caller, String current, String next, String address) {
        Passwords.check(next);
        LoginLimiter.Attempt attempt = limiter.begin(caller.name(), address);
        boolean ok = false;
        try {
            UserRow u = db.users().require(caller.name());
            ok = Passwords.matches(current, u.passwordHash());
            if (!ok) {
                throw new AuthException(AuthException.Kind.FORBIDDEN, "the current password is wrong");
            }
            db.users().change(u.name(), new UserStore.AccountChange(null, null, passwords.hash(next),
                    "password-changed", caller.sessionHash(), false), u.name());
        } finally {
            attempt.end(ok);
        }
    }

    /** Checks a password and starts a session; failures are held back by account and address ({@link LoginLimiter}). */
    public SignIn login(String name, String password, String address) {
        LoginLimiter.Attempt attempt = limiter.begin(name, address);
        boolean ok = false;
        Optional<UserRow> user;
        try {
            user = db.users().find(name);
            // Hash even for an unknown name, so the reply's timing does not tell which names exist.
            ok = (user.isPresent() ? Passwords.matches(password, user.get().passwordHash())
                    : Passwords.matches(password, decoy())) && !user.get().disabled();
        } finally {
            attempt.end(ok);
        }
        if (!ok) {
            throw new AuthException(AuthException.Kind.NOT_SIGNED_IN, "the name or password is wrong,"
                    + " or the account is disabled");
        }
        UserRow u = user.get();
        if (passwords.needsRehash(u.passwordHash())) {
            db.users().rehash(u.name(), passwords.hash(password));
        }
        String token = Secrets.token(random);
        String hash = Secrets.hash(token);
        String csrf = Secrets.token(random);
        db.users().addSession(hash, u.id(), csrf);
        return new SignIn(token, new Caller(u.name(), Role.parse(u.role()), csrf, hash));
    }

    /** Who a session cookie signs in, if it is live: not ended, not idle too long, not too old, account enabled. */
    public Optional<Caller> session(String token) {
        String hash = Secrets.hash(token);
        Optional<SessionRow> found = db.users().session(hash);
        if (found.isEmpty()) {
            return Optional.empty();
        }
        SessionRow s = found.get();
        Instant now = clock.instant();
        if (s.endedAt() != null || s.user().disabled()
                || now.isAfter(s.lastSeenAt().plus(Duration.ofMinutes(config.idleMinutes())))
                || now.isAfter(s.createdAt().plus(Duration.ofHours(config.absoluteHours())))) {
            return Optional.empty();
        }
        if (now.isAfter(s.lastSeenAt().plus(TOUCH_EVERY))) {
            db.users().touchSession(hash);
        }
        return Optional.of(new Caller(s.user().name(), Role.parse(s.user().role()), s.csrfToken(), hash));
    }

    public void logout(Caller caller) {
        if (caller.viaSession()) {
            db.users().endSession(caller.sessionHash());
        }
    }

    /** Who an API token signs in, if it is well formed, live, and its account enabled. */
    public Optional<Caller> token(String token) {
        if (!ApiTokens.wellFormed(token)) {
            return Optional.empty();
        }
        return db.users().token(Secrets.hash(token))
                .filter(t -> t.revokedAt() == null && !t.user().disabled())
                .map(t -> new Caller(t.user().name(), Role.parse(t.user().role()), null, null));
    }

    /** True when {@code token} has the shape and check characters of a token this server makes. */
    public static boolean wellFormedToken(String token) {
        return ApiTokens.wellFormed(token);
    }

    /** Makes an API token for the caller; the returned text is the only copy. */
    public String newToken(Caller caller, String name) {
        if (name == null || name.isBlank() || name.length() > 100) {
            throw new IllegalArgumentException("a token needs a name of 1 to 100 characters, to tell it apart later");
        }
        String token = ApiTokens.make(random);
        db.users().addToken(Secrets.hash(token), db.users().require(caller.name()).id(), name.strip());
        return token;
    }

    /** The caller's live tokens. */
    public List<TokenRow> tokens(Caller caller) {
        return db.users().tokensOf(caller.name());
    }

    /** Any account's live tokens, for an admin. */
    public List<TokenRow> tokensOf(String account) {
        return db.users().tokensOf(db.users().require(account).name());
    }

    /** Live tokens per account name. */
    public Map<String, Long> liveTokenCounts() {
        return db.users().liveTokenCounts();
    }

    public boolean revokeToken(Caller caller, long id) {
        return db.users().revokeToken(id, caller.name(), caller.name());
    }

    /** An admin revokes a token of any account; recorded in the account's history. */
    public boolean revokeTokenOf(String account, long id, String actor) {
        return db.users().revokeToken(id, db.users().require(account).name(), actor);
    }

    static void checkName(String name) {
        if (name == null || !NAME.matcher(name).matches()) {
            throw new IllegalArgumentException("an account name has 1 to 100 letters, digits, spaces or . _ @ -,"
                    + " and starts with no space");
        }
    }

    /** A hash to check wrong names against, made once, so unknown names cost as much as known ones. */
    private String decoy() {
        String d = decoyHash;
        if (d == null) {
            d = passwords.hash(Secrets.token(random));
            decoyHash = d;
        }
        return d;
    }
}
