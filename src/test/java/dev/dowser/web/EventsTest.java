package dev.dowser.web;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.dowser.TestSupport;
import io.undertow.Undertow;
import io.undertow.server.handlers.PathHandler;
import java.io.InputStream;
import java.net.InetSocketAddress;
import java.net.Socket;
import java.nio.charset.StandardCharsets;
import java.time.Duration;
import org.junit.jupiter.api.Test;

/** The event stream's bound: a reader that stops reading is cut off, not buffered for without end. */
class EventsTest {

    @Test
    void aStreamThatStopsReadingIsClosed() throws Exception {
        Events events = new Events();
        Undertow server = Undertow.builder().addHttpListener(0, "127.0.0.1")
                .setHandler(new PathHandler().addExactPath("/events", events.handler())).build();
        server.start();
        try (Socket stalled = new Socket()) {
            stalled.setReceiveBufferSize(4096);
            int port = ((InetSocketAddress) server.getListenerInfo().get(0).getAddress()).getPort();
            stalled.connect(new InetSocketAddress("127.0.0.1", port));
            stalled.getOutputStream().write(("GET /events?pool=p HTTP/1.1\r\nHost: 127.0.0.1\r\n\r\n")
                    .getBytes(StandardCharsets.US_ASCII));
            TestSupport.await(Duration.ofSeconds(30), () -> events.openStreams() > 0, "the event stream to open");
            String record = "r".repeat(2_000);
            int sent = 0;
            // The socket buffers on both sides fill first (a few MB on loopback), then the unsent count rises.
            while (events.openStreams() > 0 && sent < 100_000) {
                events.labelChanged("p", record, "labelled", 1);
                sent++;
            }
            assertEquals(0, events.openStreams(), "the stalled stream is still open after " + sent + " events");
            assertTrue(sent > Events.MAX_UNSENT, "closed after only " + sent + " events");
            stalled.setSoTimeout(10_000);
            InputStream in = stalled.getInputStream();
            byte[] buf = new byte[1 << 16];
            while (in.read(buf) >= 0) {
                // drain what reached the socket before the close; the end of stream must follow
            }
        } finally {
            server.stop();
        }
    }
}
