package dev.dowser.team;

import java.nio.charset.StandardCharsets;
import java.security.SecureRandom;
import java.util.regex.Pattern;
import java.util.zip.CRC32;

/**
 * The text of an API token: {@code dowser.}, 256 random bits as 52 letters and digits of Crockford's
 * base32 (no I, L, O or U, so none is mistaken for another), then {@code .} and seven check
 * characters, the CRC-32 of the middle part. The word lets a person, or a scanner of leaked
 * secrets, recognise the token; the check characters tell a token cut short or mistyped from one
 * that was revoked, without asking the database: CRC-32 detects every error burst of up to 32 bits
 * (Peterson and Brown 1961), so any one character changed, or two neighbours swapped, is caught. The server keeps only a hash ({@link Secrets#hash}).
 */
final class ApiTokens {

    static final String WORD = "dowser";
    static final int RANDOM_BYTES = 32;
    static final int BODY_CHARS = 52;
    static final int CHECK_CHARS = 7;
    private static final char[] ALPHABET = "0123456789abcdefghjkmnpqrstvwxyz".toCharArray();
    private static final Pattern SHAPE = Pattern.compile(WORD + "\\.[0-9a-hjkmnp-tv-z]{" + BODY_CHARS + "}\\."
            + "[0-9a-hjkmnp-tv-z]{" + CHECK_CHARS + "}");

    private ApiTokens() {
    }

    /** A new token. */
    static String make(SecureRandom random) {
        byte[] bits = new byte[RANDOM_BYTES];
        random.nextBytes(bits);
        String body = base32(bits, BODY_CHARS);
        return WORD + "." + body + "." + check(body);
    }

    /** True when {@code text} has a token's shape and its check characters match. */
    static boolean wellFormed(String text) {
        if (text == null || !SHAPE.matcher(text).matches()) {
            return false;
        }
        String body = text.substring(WORD.length() + 1, WORD.length() + 1 + BODY_CHARS);
        return text.endsWith("." + check(body));
    }

    /** The body's CRC-32 (32 bits, three zero bits in front) as seven base32 characters. */
    static String check(String body) {
        CRC32 crc = new CRC32();
        crc.update(body.getBytes(StandardCharsets.US_ASCII));
        long v = crc.getValue();
        char[] out = new char[CHECK_CHARS];
        for (int i = CHECK_CHARS - 1; i >= 0; i--) {
            out[i] = ALPHABET[(int) (v & 31)];
            v >>>= 5;
        }
        return new String(out);
    }

    /** The bits as base32 characters, five bits each, most significant first, zero-padded at the end. */
    static String base32(byte[] bits, int chars) {
        StringBuilder out = new StringBuilder(chars);
        int buffer = 0;
        int held = 0;
        int next = 0;
        while (out.length() < chars) {
            if (held < 5) {
                buffer = (buffer << 8) | (next < bits.length ? bits[next++] & 0xff : 0);
                held += 8;
            }
            out.append(ALPHABET[(buffer >>> (held - 5)) & 31]);
            held -= 5;
        }
        return out.toString();
    }
}
