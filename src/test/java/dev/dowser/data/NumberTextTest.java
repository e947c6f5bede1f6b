package dev.dowser.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Locale;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** The one-pass number parser against the JDK's {@link Double#parseDouble} as the reference. */
class NumberTextTest {

    private static double parse(String s) {
        char[] a = s.toCharArray();
        return NumberText.parse(a, 0, a.length);
    }

    @Test
    void agreesBitForBitWithTheJdkOnRandomDecimals() {
        SplittableRandom rng = new SplittableRandom(4180);
        for (int i = 0; i < 200_000; i++) {
            String s = switch (i % 5) {
                case 0 -> String.format(Locale.ROOT, "%.4f", rng.nextGaussian() * 100);
                case 1 -> Long.toString(rng.nextLong(-1_000_000_000_000L, 1_000_000_000_000L));
                case 2 -> Double.toString(rng.nextDouble() * Math.pow(10, rng.nextInt(-30, 30)));
                case 3 -> String.format(Locale.ROOT, "%.17g", rng.nextDouble());
                default -> rng.nextInt(0, 100) + "." + "0".repeat(rng.nextInt(0, 25)) + rng.nextInt(1, 1000)
                        + "e" + rng.nextInt(-40, 40);
            };
            assertEquals(Double.doubleToLongBits(Double.parseDouble(s)), Double.doubleToLongBits(parse(s)), s);
        }
    }

    @Test
    void acceptsPlainDecimalFormsOnly() {
        for (String ok : new String[] {"0", "-1", "+2", ".5", "5.", "1e5", "1E-5", " 7 ", "0007.50"}) {
            assertEquals(Double.parseDouble(ok.strip()), parse(ok), ok);
        }
        for (String bad : new String[] {"", "-", ".", "e5", "1e", "1.2.3", "0x10", "NaN", "Infinity", "1,5", "1 2",
            "--1", "1e+"}) {
            assertTrue(Double.isNaN(parse(bad)), bad);
        }
    }

    @Test
    void namesNonFiniteWords() {
        assertTrue(NumberText.looksNonFinite("NaN"));
        assertTrue(NumberText.looksNonFinite("-inf"));
        assertTrue(NumberText.looksNonFinite(" Infinity "));
        assertFalse(NumberText.looksNonFinite("info"));
    }

    @Test
    void overflowComesBackInfinite() {
        assertEquals(Double.POSITIVE_INFINITY, parse("1e400"));
    }
}
