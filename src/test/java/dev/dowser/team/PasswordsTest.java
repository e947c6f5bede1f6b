package dev.dowser.team;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.security.SecureRandom;
import java.util.HexFormat;
import org.junit.jupiter.api.Test;

class PasswordsTest {

    @Test
    void pbkdf2MatchesRfc7914TestVectors() {
        // RFC 7914 (scrypt), section 11: its PBKDF2-HMAC-SHA256 test vectors.
        assertEquals("55ac046e56e3089fec1691c22544b605f94185216dde0465e68b9d57c20dacbc"
                        + "49ca9cccf179b645991664b39d77ef317c71b845b1e30bd509112041d3a19783",
                hex(Passwords.pbkdf2("passwd", ascii("salt"), 1, 64)));
        assertEquals("4ddcd8f60b98be21830cee5ef22701f9641a4418d04c0414aeff08876b34ab56"
                        + "a1d425a1225833549adb841b51c9b3176a272bdebba1d078478f62b397f33c8d",
                hex(Passwords.pbkdf2("Password", ascii("NaCl"), 80_000, 64)));
    }

    @Test
    void hashesVerifyAndCarryTheirIterationCount() {
        Passwords fast = new Passwords(new SecureRandom(), 1_000);
        String stored = fast.hash("correct horse battery");
        assertTrue(stored.startsWith("pbkdf2-sha256$1000$"), stored);
        assertTrue(Passwords.matches("correct horse battery", stored));
        assertFalse(Passwords.matches("correct horse batterY", stored));
        assertNotEquals(stored, fast.hash("correct horse battery"), "each hash has its own salt");
        assertFalse(fast.needsRehash(stored));
        assertTrue(new Passwords(new SecureRandom(), 2_000).needsRehash(stored));
        assertEquals(Passwords.ITERATIONS, 600_000, "OWASP Password Storage Cheat Sheet, December 2022");
    }

    @Test
    void tooShortOrLongPasswordsAreRefusedWithTheRule() {
        Passwords p = new Passwords(new SecureRandom(), 1_000);
        assertEquals("a password needs at least 10 characters",
                assertThrows(IllegalArgumentException.class, () -> p.hash("short")).getMessage());
        assertEquals("a password may have at most 200 characters",
                assertThrows(IllegalArgumentException.class, () -> p.hash("x".repeat(201))).getMessage());
        assertEquals("a stored password hash has an unknown form",
                assertThrows(IllegalArgumentException.class, () -> Passwords.matches("whatever12", "md5$abc"))
                        .getMessage());
    }

    private static byte[] ascii(String s) {
        return s.getBytes(StandardCharsets.US_ASCII);
    }

    private static String hex(byte[] b) {
        return HexFormat.of().formatHex(b);
    }
}
