package dev.dowser.web;

import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.dowser.desk.LabelEvents;
import dev.dowser.json.Json;
import dev.dowser.rounds.RoundEvents;
import dev.dowser.rounds.RoundService;
import dev.dowser.store.RoundStatus;
import io.undertow.server.HttpHandler;
import io.undertow.server.handlers.sse.ServerSentEventConnection;
import io.undertow.server.handlers.sse.ServerSentEventHandler;
import io.undertow.util.AttachmentKey;
import java.io.IOException;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicLong;
import org.xnio.IoUtils;

/**
 * Server-sent events for pool changes, at {@code /api/v1/events?pool=NAME}: {@code round} when a
 * round starts or ends, {@code label} when a label is given or taken back. Pages listen and update
 * without a reload; a comment line every {@value #KEEP_ALIVE_MILLIS} ms keeps idle connections open.
 * A connection that falls {@value #MAX_UNSENT} events behind (a tab that stopped reading) is closed
 * instead of buffering without bound; a browser's EventSource reconnects on its own.
 */
final class Events implements RoundEvents, LabelEvents {

    static final long KEEP_ALIVE_MILLIS = 15_000;
    static final long RETRY_MILLIS = 2_000;
    static final int MAX_UNSENT = 512;
    private static final AttachmentKey<AtomicInteger> UNSENT = AttachmentKey.create(AtomicInteger.class);
    private static final ServerSentEventConnection.EventCallback SENT = new ServerSentEventConnection.EventCallback() {
        @Override
        public void done(ServerSentEventConnection c, String data, String event, String id) {
            c.getAttachment(UNSENT).decrementAndGet();
        }

        @Override
        public void failed(ServerSentEventConnection c, String data, String event, String id, IOException e) {
            c.getAttachment(UNSENT).decrementAndGet();
        }
    };

    private final ServerSentEventHandler handler;
    private final AtomicLong ids = new AtomicLong();

    Events() {
        this.handler = new ServerSentEventHandler((connection, lastEventId) -> {
            connection.putAttachment(UNSENT, new AtomicInteger());
            connection.setKeepAliveTime(KEEP_ALIVE_MILLIS);
            connection.sendRetry(RETRY_MILLIS);
        });
    }

    /** The handler to mount; it must not sit behind a blocking handler (connections stay open). */
    HttpHandler handler() {
        return exchange -> {
            if (Requests.query(exchange, "pool", null) == null) {
                Errors.send(exchange, new ApiException(400, "query parameter 'pool' is required"));
                return;
            }
            handler.handleRequest(exchange);
        };
    }

    @Override
    public void roundStarted(String pool, int round) {
        send(pool, "round", Json.object().put("round", round).put("status", RoundStatus.RUNNING.word()));
    }

    @Override
    public void roundEnded(String pool, RoundService.Outcome o) {
        send(pool, "round", Json.object().put("round", o.round()).put("status", o.status().word()).put("queued", o.queued())
                .put("kernel", o.kernel()).put("message", o.message()).put("seconds", o.seconds()));
    }

    @Override
    public void labelChanged(String pool, String record, String change, int labelsToNextRound) {
        send(pool, "label", Json.object().put("record", record).put("change", change)
                .put("labels_to_next_round", labelsToNextRound));
    }

    private void send(String pool, String type, ObjectNode data) {
        String text = Json.write(data);
        String id = Long.toString(ids.incrementAndGet());
        for (ServerSentEventConnection c : handler.getConnections()) {
            if (!pool.equals(c.getQueryParameters().get("pool").getFirst())) {
                continue;
            }
            AtomicInteger unsent = c.getAttachment(UNSENT);
            if (unsent.incrementAndGet() > MAX_UNSENT) {
                IoUtils.safeClose(c);
            } else {
                c.send(text, type, id, SENT);
            }
        }
    }

    /** Streams open now, for every pool. */
    int openStreams() {
        return handler.getConnections().size();
    }

    /** Ends every open stream, so that a graceful shutdown does not wait on them. */
    void closeAll() {
        for (ServerSentEventConnection c : handler.getConnections()) {
            c.shutdown();
        }
    }
}
