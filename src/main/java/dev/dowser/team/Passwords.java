package dev.dowser.team;

import java.security.GeneralSecurityException;
import java.security.MessageDigest;
import java.security.SecureRandom;
import java.util.Base64;
import javax.crypto.SecretKeyFactory;
import javax.crypto.spec.PBEKeySpec;

/**
 * Password hashes: PBKDF2-HMAC-SHA256 (RFC 8018, section 5.2) with a random salt per user. The
 * stored text carries the iteration count, so raising {@link #ITERATIONS} later leaves old hashes
 * readable; {@link #needsRehash} says when to store a fresh one after a good login.
 * Stored form: {@code pbkdf2-sha256$ITERATIONS$SALT$HASH}, salt and hash in unpadded base64.
 */
public final class Passwords {

    /** OWASP Password Storage Cheat Sheet's figure for PBKDF2-HMAC-SHA256 (as of December 2022). */
    public static final int ITERATIONS = 600_000;
    public static final int SALT_BYTES = 16;
    public static final int HASH_BYTES = 32;
    public static final int MIN_LENGTH = 10;
    public static final int MAX_LENGTH = 200;
    static final String SCHEME = "pbkdf2-sha256";

    private final SecureRandom random;
    private final int iterations;

    public Passwords(SecureRandom random) {
        this(random, ITERATIONS);
    }

    /** With a lower count only where speed matters more than strength: tests. */
    public Passwords(SecureRandom random, int iterations) {
        if (iterations < 1) {
            throw new IllegalArgumentException("iterations must be at least 1, got " + iterations);
        }
        this.random = random;
        this.iterations = iterations;
    }

    /** The text to store for {@code password}; fails with what to change when it is too short or long. */
    public String hash(String password) {
        check(password);
        byte[] salt = new byte[SALT_BYTES];
        random.nextBytes(salt);
        byte[] dk = pbkdf2(password, salt, iterations, HASH_BYTES);
        Base64.Encoder b64 = Base64.getEncoder().withoutPadding();
        return SCHEME + "$" + iterations + "$" + b64.encodeToString(salt) + "$" + b64.encodeToString(dk);
    }

    /** True when {@code password} gives {@code stored}; compared in constant time. */
    public static boolean matches(String password, String stored) {
        String[] parts = stored.split("\\$");
        if (parts.length != 4 || !parts[0].equals(SCHEME)) {
            throw new IllegalArgumentException("a stored password hash has an unknown form");
        }
        int count = Integer.parseInt(parts[1]);
        byte[] salt = Base64.getDecoder().decode(parts[2]);
        byte[] expected = Base64.getDecoder().decode(parts[3]);
        byte[] actual = pbkdf2(password, salt, count, expected.length);
        return MessageDigest.isEqual(expected, actual);
    }

    /** True when {@code stored} was made with fewer iterations than this hasher uses. */
    public boolean needsRehash(String stored) {
        String[] parts = stored.split("\\$");
        return parts.length != 4 || Integer.parseInt(parts[1]) < iterations;
    }

    public static void check(String password) {
        if (password == null || password.length() < MIN_LENGTH) {
            throw new IllegalArgumentException("a password needs at least " + MIN_LENGTH + " characters");
        }
        if (password.length() > MAX_LENGTH) {
            throw new IllegalArgumentException("a password may have at most " + MAX_LENGTH + " characters");
        }
    }

    /** PBKDF2-HMAC-SHA256 of {@code password}; the JDK's key factory takes its chars as UTF-8 bytes. */
    static byte[] pbkdf2(String password, byte[] salt, int iterations, int dkLen) {
        PBEKeySpec spec = new PBEKeySpec(password.toCharArray(), salt, iterations, dkLen * 8);
        try {
            return SecretKeyFactory.getInstance("PBKDF2WithHmacSHA256").generateSecret(spec).getEncoded();
        } catch (GeneralSecurityException e) {
            throw new IllegalStateException("this Java has no PBKDF2WithHmacSHA256", e);
        } finally {
            spec.clearPassword();
        }
    }
}
