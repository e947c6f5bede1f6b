package dev.dowser.team;

import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.security.SecureRandom;
import java.util.Base64;
import java.util.HexFormat;

/** Random tokens and their stored hashes. */
final class Secrets {

    /** 256 bits: as many as SHA-256 keeps, far past guessing. */
    static final int TOKEN_BYTES = 32;

    private Secrets() {
    }

    /** 256 random bits as 43 characters of unpadded base64url, safe in cookies and headers. */
    static String token(SecureRandom random) {
        byte[] b = new byte[TOKEN_BYTES];
        random.nextBytes(b);
        return Base64.getUrlEncoder().withoutPadding().encodeToString(b);
    }

    /**
     * SHA-256 of a token, hex. A fast hash is enough here: the tokens are random and 256 bits long,
     * so there is no dictionary to try, unlike passwords.
     */
    static String hash(String token) {
        try {
            return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256")
                    .digest(token.getBytes(StandardCharsets.UTF_8)));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("this Java has no SHA-256", e);
        }
    }

    /** Equal strings, compared in time that does not depend on where they differ. */
    static boolean same(String a, String b) {
        return a != null && b != null && MessageDigest.isEqual(a.getBytes(StandardCharsets.UTF_8),
                b.getBytes(StandardCharsets.UTF_8));
    }
}
