package dev.dowser.web;

import io.undertow.server.HttpHandler;
import io.undertow.server.HttpServerExchange;
import io.undertow.util.AttachmentKey;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.util.concurrent.Executor;
import java.util.concurrent.TimeUnit;
import org.xnio.ChannelListener;
import org.xnio.IoUtils;
import org.xnio.XnioExecutor;
import org.xnio.channels.StreamSourceChannel;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Reads a bounded request body before its handler runs, without holding a thread while the bytes
 * arrive: what is there is read at once, the rest by the connection's I/O thread as it comes. A
 * body must arrive whole within a deadline; a late or abandoned one ends the connection with one
 * line in the log, and one over its limit is refused with 413 as soon as that is known (before a
 * byte is read when the client declares its length), the rest of it dropped by {@link LingeringClose}.
 */
final class Bodies {

    static final AttachmentKey<byte[]> BODY = AttachmentKey.create(byte[].class);
    private static final Logger LOG = LoggerFactory.getLogger(Bodies.class);
    private static final int CHUNK_BYTES = 8_192;

    private Bodies() {
    }

    /** The body read for this request (empty when there was none). */
    static byte[] of(HttpServerExchange ex) {
        byte[] b = ex.getAttachment(BODY);
        return b == null ? new byte[0] : b;
    }

    /** The refusal of a body over {@code limit} bytes, naming the limit. */
    static ApiException tooLarge(HttpServerExchange ex, long limit) {
        return new ApiException(413, "the body of " + ex.getRequestMethod() + " " + ex.getRequestPath()
                + " may hold at most " + Bytes.text(limit) + "; nothing was read or changed");
    }

    /**
     * Reads the body (at most {@code limit} bytes, whole within {@code timeoutMillis}), attaches it,
     * then runs {@code next} on {@code executor}, or on this thread when the body was already there
     * and {@code executor} is null.
     */
    static void receive(HttpServerExchange ex, int limit, long timeoutMillis, Executor executor, HttpHandler next)
            throws Exception {
        if (ex.isRequestComplete()) {
            run(ex, executor, next, false);
            return;
        }
        new Reading(ex, limit, timeoutMillis, executor, next).start();
    }

    private static void run(HttpServerExchange ex, Executor executor, HttpHandler next, boolean onIoThread)
            throws Exception {
        if (executor == null && !onIoThread) {
            next.handleRequest(ex);
        } else if (executor == null) {
            ex.dispatch(next);
        } else {
            ex.dispatch(executor, next);
        }
    }

    /** Ends the exchange of a client that stopped sending, logging one line (never a stack trace). */
    static void abandoned(HttpServerExchange ex, long received, String why) {
        LOG.warn("{} {} from {}: {} after {} bytes of its body; the connection is closed", ex.getRequestMethod(),
                ex.getRequestPath(), ex.getSourceAddress(), why, received);
        ex.setPersistent(false);
        IoUtils.safeClose(ex.getConnection());
        ex.endExchange();
    }

    /** One body on its way in. Its I/O thread runs the listener and the deadline, so they never overlap. */
    private static final class Reading implements ChannelListener<StreamSourceChannel> {

        private final HttpServerExchange ex;
        private final int limit;
        private final long timeoutMillis;
        private final Executor executor;
        private final HttpHandler next;
        private final StreamSourceChannel channel;
        private final ByteArrayOutputStream body;
        private final ByteBuffer chunk = ByteBuffer.allocate(CHUNK_BYTES);
        private XnioExecutor.Key deadline;
        private boolean finished;

        Reading(HttpServerExchange ex, int limit, long timeoutMillis, Executor executor, HttpHandler next) {
            this.ex = ex;
            this.limit = limit;
            this.timeoutMillis = timeoutMillis;
            this.executor = executor;
            this.next = next;
            this.channel = LingeringClose.take(ex);
            long declared = ex.getRequestContentLength();
            this.body = new ByteArrayOutputStream(declared > 0 ? (int) Math.min(declared, limit) : 512);
        }

        synchronized void start() throws Exception {
            if (drain(false)) {
                return;
            }
            deadline = ex.getIoThread().executeAfter(this::late, timeoutMillis, TimeUnit.MILLISECONDS);
            channel.getReadSetter().set(this);
            channel.resumeReads();
        }

        @Override
        public synchronized void handleEvent(StreamSourceChannel c) {
            try {
                drain(true);
            } catch (Exception e) {
                finish();
                Errors.send(ex, e);
            }
        }

        /** Reads what has arrived; true once the body is done with (complete, refused or abandoned). */
        private boolean drain(boolean onIoThread) throws Exception {
            if (finished) {
                return true;
            }
            while (true) {
                chunk.clear();
                int n;
                try {
                    n = channel.read(chunk);
                } catch (IOException e) {
                    finish();
                    if (e instanceof io.undertow.server.RequestTooBigException) {
                        Errors.send(ex, tooLarge(ex, limit));
                    } else {
                        abandoned(ex, body.size(), "the client stopped sending (" + e.getMessage() + ")");
                    }
                    return true;
                }
                if (n == 0) {
                    return false;
                }
                if (n < 0) {
                    finish();
                    ex.putAttachment(BODY, body.toByteArray());
                    run(ex, executor, next, onIoThread);
                    return true;
                }
                if (body.size() + n > limit) {
                    finish();
                    Errors.send(ex, tooLarge(ex, limit));
                    return true;
                }
                body.write(chunk.array(), 0, n);
            }
        }

        private synchronized void late() {
            deadline = null;
            if (!finished) {
                finish();
                abandoned(ex, body.size(), "the body did not arrive within " + timeoutMillis + " ms");
            }
        }

        private void finish() {
            finished = true;
            channel.getReadSetter().set(null);
            channel.suspendReads();
            if (deadline != null) {
                deadline.remove();
                deadline = null;
            }
        }
    }
}
