package dev.dowser.records;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Set;
import org.junit.jupiter.api.Test;

/** Repeated ids are found whether the hashes fit in memory or spill to disk. */
class KeyCheckTest {

    @Test
    void fnv1aPartMatchesThePublishedVectors() {
        // FNV-1a 64-bit test vectors from the FNV reference page (Fowler, Noll, Vo): "" -> cbf29ce484222325,
        // "a" -> af63dc4c8601ec8c, "foobar" -> 85944171f73967e8 (values from memory of that page).
        assertEquals(0xcbf29ce484222325L, KeyCheck.fnv1a(""));
        assertEquals(0xaf63dc4c8601ec8cL, KeyCheck.fnv1a("a"));
        assertEquals(0x85944171f73967e8L, KeyCheck.fnv1a("foobar"));
    }

    @Test
    void findsRepeatsInMemory() {
        try (KeyCheck k = new KeyCheck(1_000)) {
            for (int i = 0; i < 500; i++) {
                k.add("id" + i);
            }
            k.add("id42");
            assertEquals(Set.of(KeyCheck.hash("id42")), k.repeated());
        }
    }

    @Test
    void findsRepeatsAcrossSpilledRuns() {
        try (KeyCheck k = new KeyCheck(100)) {
            for (int i = 0; i < 1_000; i++) {
                k.add("id" + i);
            }
            k.add("id7");
            k.add("id999");
            assertEquals(Set.of(KeyCheck.hash("id7"), KeyCheck.hash("id999")), k.repeated());
        }
    }

    @Test
    void noRepeatsNoCandidates() {
        try (KeyCheck k = new KeyCheck(64)) {
            for (int i = 0; i < 1_000; i++) {
                k.add(Integer.toString(i));
            }
            assertTrue(k.repeated().isEmpty());
        }
    }
}
