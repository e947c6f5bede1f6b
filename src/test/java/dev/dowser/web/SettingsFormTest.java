package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.dowser.acquire.ColdStart;
import dev.dowser.rounds.Strategy;
import dev.dowser.words.Worded;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;

/**
 * The overview's settings form offers every word the API takes for a choice. The form's lists are
 * written by hand; a word missing from them makes the form show, and save, another choice than the
 * pool's (margin was missing until typiclust-power was added beside it).
 */
class SettingsFormTest {

    static final Path OVERVIEW = Path.of("web", "overview.html");

    @Test
    void theFormOffersEveryStrategyAndColdStart() throws IOException {
        String html = Files.readString(OVERVIEW);
        assertEquals(Worded.words(Strategy.class), options(html, "strategy"));
        assertEquals(Worded.words(ColdStart.Method.class).stream().sorted().toList(),
                options(html, "cold_start").stream().sorted().toList());
    }

    /** The option values of the select named {@code name}, in the form's order. */
    private static List<String> options(String html, String name) {
        Matcher select = Pattern.compile("<select name=\"" + Pattern.quote(name) + "\"(.*?)</select>", Pattern.DOTALL)
                .matcher(html);
        if (!select.find()) {
            throw new AssertionError("no select named " + name + " in " + OVERVIEW);
        }
        List<String> values = new ArrayList<>();
        Matcher option = Pattern.compile("<option value=\"([^\"]*)\"").matcher(select.group(1));
        while (option.find()) {
            values.add(option.group(1));
        }
        return values;
    }
}
