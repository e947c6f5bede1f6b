package dev.dowser.web;

import io.undertow.server.HttpServerExchange;
import io.undertow.server.RequestTooBigException;
import io.undertow.server.protocol.http.HttpContinue;
import io.undertow.util.AttachmentKey;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.util.concurrent.TimeUnit;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import org.xnio.ChannelListener;
import org.xnio.IoUtils;
import org.xnio.XnioExecutor;
import org.xnio.channels.StreamSinkChannel;
import org.xnio.channels.StreamSourceChannel;

/**
 * Answers a request whose body is still arriving, then closes its connection in stages: the answer
 * goes out whole and the server's side is shut, then what the client still sends is read and
 * dropped for a bounded time and amount, and only then is the connection closed. Closing on bytes
 * not yet read makes the operating system reset the connection, and a client still sending then
 * loses the answer (RFC 9112, section 9.6, "Tear-down": the half-close, then reading until the
 * client closes or has surely received the answer). Nothing is kept of the dropped bytes.
 */
final class LingeringClose {

    /** The most a refused client may still send; past it the connection is closed regardless. */
    static final long MAX_DROPPED_BYTES = 64L << 20;
    /** The longest the server reads on after its answer. */
    static final long MAX_LINGER_MILLIS = 10_000;
    /** A client silent this long after the answer has stopped sending (common practice: 2 s). */
    static final long SILENCE_MILLIS = 2_000;

    private static final AttachmentKey<StreamSourceChannel> BODY_CHANNEL =
            AttachmentKey.create(StreamSourceChannel.class);
    private static final Logger LOG = LoggerFactory.getLogger(LingeringClose.class);
    private static final int SCRATCH_BYTES = 8_192;

    private final HttpServerExchange ex;
    private final StreamSourceChannel in;
    private final StreamSinkChannel out;
    private final ByteBuffer answer;
    private final ByteBuffer scratch = ByteBuffer.allocate(SCRATCH_BYTES);
    private final long until;
    private long lastHeard;
    private long dropped;
    private XnioExecutor.Key timer;
    private boolean done;

    private LingeringClose(HttpServerExchange ex, StreamSourceChannel in, ByteBuffer answer) {
        this.ex = ex;
        this.in = in;
        this.answer = answer;
        this.out = ex.getResponseChannel();
        this.lastHeard = System.nanoTime();
        this.until = lastHeard + TimeUnit.MILLISECONDS.toNanos(MAX_LINGER_MILLIS);
    }

    /** The request's body channel, taken by a reader; remembered so that a refusal can read on after answering. */
    static StreamSourceChannel take(HttpServerExchange ex) {
        StreamSourceChannel channel = ex.getRequestChannel();
        ex.putAttachment(BODY_CHANNEL, channel);
        return channel;
    }

    /**
     * Sends {@code status} with the JSON {@code body} and closes the connection after it, reading on
     * whatever of the request's body is still to come. A client that waits for "100 Continue" before
     * sending was never told to send, so its connection simply closes after the answer.
     */
    static void send(HttpServerExchange ex, int status, String body) {
        StreamSourceChannel in = ex.getAttachment(BODY_CHANNEL);
        if (in == null && ex.isRequestChannelAvailable()
                && (!HttpContinue.requiresContinueResponse(ex) || HttpContinue.isContinueResponseSent(ex))) {
            // Nobody read the body yet, but it may be on its way: it is dropped up to the bounds below.
            ex.setMaxEntitySize(0);
            in = ex.getRequestChannel();
        }
        ex.setPersistent(false);
        if (in == null || !ex.isResponseChannelAvailable()) {
            Responses.jsonText(ex, status, body);
            return;
        }
        byte[] bytes = body.getBytes(StandardCharsets.UTF_8);
        Responses.jsonHeaders(ex, status);
        ex.setResponseContentLength(bytes.length);
        in.getReadSetter().set(null);
        in.suspendReads();
        new LingeringClose(ex, in, ByteBuffer.wrap(bytes)).answer();
    }

    /** Writes the answer and shuts the server's side; the drop starts once it is all out. */
    private synchronized void answer() {
        try {
            while (answer.hasRemaining()) {
                if (out.write(answer) == 0) {
                    out.getWriteSetter().set(c -> resume());
                    out.resumeWrites();
                    return;
                }
            }
            out.shutdownWrites();
            if (!out.flush()) {
                out.getWriteSetter().set(c -> resume());
                out.resumeWrites();
                return;
            }
            out.getWriteSetter().set(null);
            out.suspendWrites();
        } catch (IOException e) {
            close("the answer could not be sent (" + e.getMessage() + ")");
            return;
        }
        timer = ex.getIoThread().executeAfter(this::tick, SILENCE_MILLIS, TimeUnit.MILLISECONDS);
        in.getReadSetter().set(c -> drop());
        drop();
    }

    private synchronized void resume() {
        if (!done) {
            out.suspendWrites();
            answer();
        }
    }

    /** Reads and drops what has arrived; the connection closes at the body's end or past the bounds. */
    private synchronized void drop() {
        if (done) {
            return;
        }
        try {
            while (true) {
                scratch.clear();
                int n = in.read(scratch);
                if (n < 0) {
                    // The body is complete: Undertow ends the exchange and closes the connection.
                    finish();
                    return;
                }
                if (n == 0) {
                    in.resumeReads();
                    return;
                }
                lastHeard = System.nanoTime();
                dropped += n;
                if (dropped > MAX_DROPPED_BYTES) {
                    close("it sent more than " + Bytes.text(MAX_DROPPED_BYTES) + " after its refusal");
                    return;
                }
            }
        } catch (RequestTooBigException e) {
            close("it sent more than Undertow's cut-off of " + Bytes.text(ex.getMaxEntitySize()) + " in all");
        } catch (IOException e) {
            // The client closed its side before the body's end: it has the answer.
            close(null);
        }
    }

    /** Runs on the I/O thread every {@link #SILENCE_MILLIS} until the client falls silent or time is up. */
    private synchronized void tick() {
        timer = null;
        if (done) {
            return;
        }
        long now = System.nanoTime();
        if (now - lastHeard >= TimeUnit.MILLISECONDS.toNanos(SILENCE_MILLIS)) {
            close(null);
        } else if (now >= until) {
            close("it was still sending " + MAX_LINGER_MILLIS + " ms after its refusal");
        } else {
            timer = ex.getIoThread().executeAfter(this::tick, SILENCE_MILLIS, TimeUnit.MILLISECONDS);
        }
    }

    private void close(String why) {
        if (why != null) {
            LOG.warn("{} {} from {}: {}; the connection is closed", ex.getRequestMethod(), ex.getRequestPath(),
                    ex.getSourceAddress(), why);
        }
        finish();
        IoUtils.safeClose(ex.getConnection());
        ex.endExchange();
    }

    private void finish() {
        done = true;
        in.getReadSetter().set(null);
        in.suspendReads();
        if (timer != null) {
            timer.remove();
            timer = null;
        }
    }
}
