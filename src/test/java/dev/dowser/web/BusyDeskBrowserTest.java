package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import dev.dowser.store.Database;
import dev.dowser.store.LabelStore;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.PreparedStatement;
import java.sql.SQLException;
import java.time.Duration;
import java.util.List;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.WebElement;
import org.openqa.selenium.interactions.Actions;

/**
 * A busy database answers 503 and changes nothing, so the desk sends such a call again after the
 * wait the server names, and the person sees no error when the second try goes through (the queue
 * engineer's walk saw about 2% of desk calls answer busy under load). The busy answer is real: the
 * test holds a row lock in the real H2 file database, through a connection of its own, until the
 * server has answered busy once. Headless Chromium against the real server.
 */
class BusyDeskBrowserTest extends BrowserFixture {

    static final String PERSON = "lee";

    long pool;

    @BeforeEach
    void start() {
        pool = openGauges(PERSON);
    }

    @Test
    void aLabelAnsweredBusyIsSentAgainAndGoesThrough() throws Exception {
        TestSupport.await(Duration.ofSeconds(60), () -> db.queues().servedRound(pool).isPresent(),
                "the first batch, served without anyone asking");
        signIn(PERSON);
        browser.driver.get(base() + "desk.html?pool=gauges");
        String first = browser.await(d -> cardId().isEmpty() ? null : cardId(), "a record on the desk");
        long row = Long.parseLong(first.substring(1));

        try (SlowClientsTest.LogCapture log = new SlowClientsTest.LogCapture();
             Connection holder = DriverManager.getConnection("jdbc:h2:file:"
                     + dir.resolve("db").resolve(Database.FILE_STEM).toAbsolutePath(), "dowser", "")) {
            // Another change holds the lease's row: storing the label must wait for it, and gives up busy.
            holder.setAutoCommit(false);
            try (PreparedStatement p = holder.prepareStatement(
                    "UPDATE leases SET lease_until = lease_until WHERE pool_id = ? AND row_no = ?")) {
                p.setLong(1, pool);
                p.setLong(2, row);
                assertEquals(1, p.executeUpdate(), "the record shown is leased to " + PERSON);
            }
            new Actions(browser.driver).sendKeys("1").perform();
            TestSupport.await(Duration.ofSeconds(120), () -> log.text().contains("answered busy"),
                    "the server to answer the label busy");
            holder.rollback();
            assertTrue(log.text().contains("request POST /api/v1/pools/gauges/labels answered busy"), log.text());
        } catch (SQLException e) {
            throw new AssertionError("the test's own hold on the lease failed: " + e.getMessage(), e);
        }
        WebElement message = browser.byId("desk-message");
        browser.await(d -> {
            if (message.getAttribute("class").contains("error")) {
                throw new AssertionError("the desk showed the busy answer instead of sending the label again: "
                        + message.getText());
            }
            String now = cardId();
            return now.isEmpty() || now.equals(first) ? null : now;
        }, "the next record, once the label went through on a later try");
        assertEquals(first + " labelled ok.", message.getText());
        assertFalse(message.getAttribute("class").contains("error"), message.getAttribute("class"));
        List<LabelStore.Entry> history = db.labels().history(pool, row);
        assertEquals(1, history.size(), "one label, stored once: " + history);
        assertEquals("ok", history.get(0).label());
        assertEquals(PERSON, history.get(0).by());
        browser.screenshot("busy-label-sent-again");
    }
}
