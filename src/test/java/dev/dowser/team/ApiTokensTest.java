package dev.dowser.team;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.security.SecureRandom;
import java.util.HashSet;
import java.util.Set;
import org.junit.jupiter.api.Test;

/** The text of API tokens: shape, packing, and the check characters that catch a mistyped token. */
class ApiTokensTest {

    /** RFC 4648, section 10's base32 vectors, its alphabet (A-Z, 2-7) mapped letter by letter onto ours. */
    @Test
    void bitsArePackedAsInRfc4648() {
        String rfc = "ABCDEFGHIJKLMNOPQRSTUVWXYZ234567";
        String[][] vectors = {{"f", "MY"}, {"fo", "MZXQ"}, {"foo", "MZXW6"}, {"foob", "MZXW6YQ"},
            {"fooba", "MZXW6YTB"}, {"foobar", "MZXW6YTBOI"}};
        for (String[] v : vectors) {
            StringBuilder ours = new StringBuilder();
            for (char c : v[1].toCharArray()) {
                ours.append("0123456789abcdefghjkmnpqrstvwxyz".charAt(rfc.indexOf(c)));
            }
            byte[] bytes = v[0].getBytes(StandardCharsets.US_ASCII);
            assertEquals(ours.toString(), ApiTokens.base32(bytes, v[1].length()), v[0]);
        }
    }

    /** CRC-32's published check value: "123456789" gives 0xCBF43926 (Williams 1993, the catalogue's CRC-32). */
    @Test
    void theCheckIsCrc32() {
        assertEquals(expectedCheck(), ApiTokens.check("123456789"));
    }

    /** 0xCBF43926 in 35 bits (three zero bits first), five at a time. */
    private static String expectedCheck() {
        long v = 0xCBF43926L;
        StringBuilder s = new StringBuilder();
        for (int shift = 30; shift >= 0; shift -= 5) {
            s.append("0123456789abcdefghjkmnpqrstvwxyz".charAt((int) ((v >>> shift) & 31)));
        }
        return s.toString();
    }

    @Test
    void tokensHaveOurShapeAndAreNeverTheSame() {
        SecureRandom random = new SecureRandom();
        Set<String> seen = new HashSet<>();
        for (int i = 0; i < 1_000; i++) {
            String t = ApiTokens.make(random);
            assertTrue(t.matches("dowser\\.[0-9a-hjkmnp-tv-z]{52}\\.[0-9a-hjkmnp-tv-z]{7}"), t);
            assertTrue(ApiTokens.wellFormed(t), t);
            assertTrue(seen.add(t));
        }
        assertFalse(ApiTokens.wellFormed(null));
        assertFalse(ApiTokens.wellFormed(""));
        assertFalse(ApiTokens.wellFormed("dowser.abc"));
        assertFalse(ApiTokens.wellFormed("DOWSER." + ApiTokens.make(random).substring("dowser.".length())));
    }

    /** Every token with one character changed, or two neighbours swapped, is refused by its check. */
    @Test
    void aMistypedCharacterIsAlwaysCaught() {
        SecureRandom random = new SecureRandom();
        String alphabet = "0123456789abcdefghjkmnpqrstvwxyz";
        for (int k = 0; k < 20; k++) {
            String t = ApiTokens.make(random);
            for (int i = "dowser.".length(); i < t.length(); i++) {
                if (t.charAt(i) == '.') {
                    continue;
                }
                for (char c : alphabet.toCharArray()) {
                    if (c != t.charAt(i)) {
                        String typo = t.substring(0, i) + c + t.substring(i + 1);
                        assertFalse(ApiTokens.wellFormed(typo), typo);
                    }
                }
                if (i + 1 < t.length() && t.charAt(i + 1) != '.' && t.charAt(i + 1) != t.charAt(i)) {
                    String swapped = t.substring(0, i) + t.charAt(i + 1) + t.charAt(i) + t.substring(i + 2);
                    assertFalse(ApiTokens.wellFormed(swapped), swapped);
                }
            }
            assertFalse(ApiTokens.wellFormed(t.substring(0, t.length() - 1)), "cut short");
        }
    }
}
