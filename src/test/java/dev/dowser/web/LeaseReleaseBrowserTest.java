package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.dowser.TestSupport;
import dev.dowser.store.QueueStore;
import java.time.Duration;
import java.util.Optional;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.Keys;
import org.openqa.selenium.interactions.Actions;

/**
 * A record shown on a desk is leased to the person at it; the lease ends when the record leaves the
 * desk without a label, not ten minutes later (issue 14): when the tab is left (the page hides) and
 * when an undo brings back an earlier record in place of the one shown. Headless Chromium against
 * the real server and H2 file database; the leases are read from the store.
 */
class LeaseReleaseBrowserTest extends BrowserFixture {

    static final String PERSON = "lee";

    long pool;

    @BeforeEach
    void start() {
        pool = openGauges(PERSON);
    }

    /** Who holds the record with id {@code id} in the served queue, if anyone. */
    private Optional<String> holder(String id) {
        long row = Long.parseLong(id.substring(1));
        return db.queues().served(pool).stream().map(QueueStore.Served::entry).filter(e -> e.row() == row)
                .findFirst().map(e -> e.leasedTo());
    }

    private String nextCard(String shown, String what) {
        return browser.await(d -> {
            String now = cardId();
            return now.isEmpty() || now.equals(shown) ? null : now;
        }, what);
    }

    @Test
    void aRecordLeavingTheDeskWithoutALabelIsFreeAtOnce() {
        TestSupport.await(Duration.ofSeconds(60), () -> db.queues().servedRound(pool).isPresent(),
                "the first batch, served without anyone asking");
        signIn(PERSON);

        // The tab leaves the desk: the record shown is free again at once.
        browser.driver.get(base() + "desk.html?pool=gauges");
        String first = nextCard("", "the first record on the desk");
        assertEquals(Optional.of(PERSON), holder(first), "the record shown is leased to the person at the desk");
        browser.driver.get(base() + "overview.html?pool=gauges");
        TestSupport.await(Duration.ofSeconds(10), () -> holder(first).isEmpty(),
                "the lease on " + first + " ended when the desk was left");

        // An undo brings back the record just labelled; the one shown after it goes back to the queue.
        browser.driver.get(base() + "desk.html?pool=gauges");
        String labelled = nextCard("", "a record on the desk again");
        new Actions(browser.driver).sendKeys("1").perform();
        String after = nextCard(labelled, "the record after the label");
        assertEquals(Optional.of(PERSON), holder(after));
        new Actions(browser.driver).sendKeys(Keys.BACK_SPACE).perform();
        browser.await(d -> cardId().equals(labelled) ? labelled : null, "the label taken back, its record shown again");
        assertEquals(Optional.of(PERSON), holder(labelled), "the record taken back is the person's again");
        TestSupport.await(Duration.ofSeconds(10), () -> holder(after).isEmpty(),
                "the lease on " + after + " ended when the undo replaced it");
        browser.screenshot("lease-released-after-undo");
    }
}
