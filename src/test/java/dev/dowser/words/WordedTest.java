package dev.dowser.words;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import dev.dowser.acquire.ColdStart;
import dev.dowser.data.FileFormat;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Strategy;
import dev.dowser.sampler.KernelChoice;
import dev.dowser.store.RoundStatus;
import dev.dowser.team.Role;
import java.util.List;
import java.util.Optional;
import org.junit.jupiter.api.Test;

/** The one way a typed or stored word becomes an enum constant, and the one refusal. */
class WordedTest {

    enum Colour implements Worded { RED, DARK_GREEN }

    @Test
    void aWordIsTheLowerCaseNameAndIsFoundWhateverItsCaseAndSpaces() {
        assertEquals("dark_green", Colour.DARK_GREEN.word());
        assertEquals(Colour.DARK_GREEN, Worded.parse(Colour.class, "  Dark_Green ", "colour"));
        assertEquals(Optional.empty(), Worded.find(Colour.class, null));
        assertEquals(List.of("red", "dark_green"), Worded.words(Colour.class));
    }

    @Test
    void anUnknownWordIsRefusedNamingWhatAndEveryChoice() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Worded.parse(Colour.class, "blue", "colour"));
        assertEquals("unknown colour 'blue': use red or dark_green", e.getMessage());
        assertEquals("unknown colour 'null': use red or dark_green",
                assertThrows(IllegalArgumentException.class, () -> Worded.parse(Colour.class, null, "colour"))
                        .getMessage());
        assertEquals("unknown role 'boss': use labeller, reviewer or admin",
                assertThrows(IllegalArgumentException.class, () -> Role.parse("boss")).getMessage());
    }

    @Test
    void enumsWithWordsOfTheirOwnParseByThem() {
        assertEquals(ColdStart.Method.KMEANS_PLUS_PLUS, ColdStart.Method.parse("KMeans++"));
        assertEquals("unknown cold start 'lloyd': use kmeans++ or typiclust",
                assertThrows(IllegalArgumentException.class, () -> ColdStart.Method.parse("lloyd")).getMessage());
        assertEquals(FileFormat.JSONL, FileFormat.parse("JSONL"));
        assertEquals("unknown kernel 'hmc': use auto, sgld, psgld, mala or sghmc",
                assertThrows(IllegalArgumentException.class, () -> KernelChoice.parse("hmc")).getMessage());
        for (RoundStatus s : RoundStatus.values()) {
            assertEquals(s, RoundStatus.parse(s.word()));
        }
    }

    @Test
    void aStrategyMayBeTheDefaultWord() {
        assertEquals(PoolSettings.DEFAULT_STRATEGY, Strategy.parse(" Default"));
        assertEquals(Strategy.BATCHBALD, Strategy.parse("batchbald"));
        assertEquals("unknown strategy 'greedy': use bald, power, typiclust-power, typiclust-mix, batchbald, entropy, margin, random or default",
                assertThrows(IllegalArgumentException.class, () -> Strategy.parse("greedy")).getMessage());
    }
}
