package dev.dowser.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.fail;

import dev.dowser.TestSupport;
import dev.dowser.store.Database;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Malformed input of every kind (random bytes, cut lines, stray quotes, huge fields, wrong
 * types) never makes the importer throw anything but its own error, and a failed import leaves
 * the database exactly as it was. Fixed seeds: a failure here reproduces.
 */
class ImporterFuzzTest {

    static final int CASES = 400;
    static final String VALID = "id,flow,site,trace,label\n"
            + "a1,1.5,north,\"[1,2,3]\",ok\n"
            + "a2,2.25,south,\"[4,5,6]\",fault\n"
            + "a3,,north,\"[7,8,9]\",\n"
            + "a4,-3e2,\"we,st\",\"[0,0,1]\",ok\n";

    @TempDir
    Path dir;

    @Test
    void csvMutationsFailCleanly() {
        run(new SplittableRandom(1), false);
    }

    @Test
    void jsonLinesMutationsFailCleanly() {
        run(new SplittableRandom(2), true);
    }

    private void run(SplittableRandom rng, boolean jsonLines) {
        try (Database db = TestSupport.openDb(dir)) {
            TestSupport.importText(db, "kept", VALID, TestSupport.csv("kept").withId("id").withLabel("label"));
            String seed = jsonLines ? toJsonLines(VALID) : VALID;
            int failures = 0;
            for (int i = 0; i < CASES; i++) {
                byte[] input = mutate(seed.getBytes(StandardCharsets.UTF_8), rng);
                String pool = "fuzz" + i;
                ImportSpec spec = (jsonLines ? TestSupport.jsonl(pool) : TestSupport.csv(pool))
                        .withLimits(ImportSpec.DEFAULT_MAX_LEVELS, 64, 4_096);
                if (rng.nextBoolean()) {
                    spec = spec.withId("id").withLabel("label");
                }
                Map<String, Long> before = TestSupport.tableCounts(dir);
                try {
                    TestSupport.importBytes(db, input, spec);
                } catch (ImportException expected) {
                    failures++;
                    assertEquals(before, TestSupport.tableCounts(dir), "case " + i + " changed the database");
                } catch (RuntimeException e) {
                    fail("case " + i + " threw " + e + " for input:\n" + new String(input, StandardCharsets.UTF_8), e);
                }
            }
            // Most mutations must break the file, or the test proves little.
            if (failures < CASES / 2) {
                fail("only " + failures + " of " + CASES + " mutated files were refused");
            }
        }
    }

    static byte[] mutate(byte[] valid, SplittableRandom rng) {
        byte[] b = valid.clone();
        switch (rng.nextInt(7)) {
            case 0 -> {
                // Random bytes.
                b = new byte[rng.nextInt(0, 300)];
                for (int i = 0; i < b.length; i++) {
                    b[i] = (byte) rng.nextInt(256);
                }
            }
            case 1 -> b = java.util.Arrays.copyOf(b, rng.nextInt(0, b.length));
            case 2 -> b = insert(b, rng.nextInt(b.length), "\"");
            case 3 -> b = insert(b, rng.nextInt(b.length), "9".repeat(rng.nextInt(60, 5_000)));
            case 4 -> b = insert(b, rng.nextInt(b.length), new String[] {"abc", "NaN", "inf", "1e999", ",", "\n",
                "[1,", "{", "}", "null", "\r"}[rng.nextInt(11)]);
            case 5 -> {
                for (int k = 0; k < 3; k++) {
                    b[rng.nextInt(b.length)] = (byte) rng.nextInt(256);
                }
            }
            default -> b = insert(b, b.length, new String(valid, StandardCharsets.UTF_8).split("\n")[1] + "\n");
        }
        return b;
    }

    private static byte[] insert(byte[] b, int at, String s) {
        byte[] add = s.getBytes(StandardCharsets.UTF_8);
        byte[] out = new byte[b.length + add.length];
        System.arraycopy(b, 0, out, 0, at);
        System.arraycopy(add, 0, out, at, add.length);
        System.arraycopy(b, at, out, at + add.length, b.length - at);
        return out;
    }

    private static String toJsonLines(String csv) {
        return "{\"id\":\"a1\",\"flow\":1.5,\"site\":\"north\",\"trace\":[1,2,3],\"label\":\"ok\"}\n"
                + "{\"id\":\"a2\",\"flow\":2.25,\"site\":\"south\",\"trace\":[4,5,6],\"label\":\"fault\"}\n"
                + "{\"id\":\"a3\",\"flow\":null,\"site\":\"north\",\"trace\":[7,8,9]}\n";
    }
}
