package dev.dowser.web;

import io.undertow.server.RequestTooBigException;
import java.io.IOException;
import java.io.InputStream;
import java.nio.ByteBuffer;
import java.util.concurrent.TimeUnit;
import java.util.function.LongFunction;
import org.xnio.channels.StreamSourceChannel;

/**
 * An upload's body as a stream, read on the calling thread straight from the connection: it gives
 * up when the client sends nothing for {@code stallMillis} or goes away ({@link ClientGone}), and
 * past the limit it throws the refusal {@code tooLarge} makes from the bytes received.
 */
final class UploadStream extends InputStream {

    private final StreamSourceChannel channel;
    private final long stallMillis;
    private final LongFunction<RuntimeException> tooLarge;
    private long received;

    UploadStream(StreamSourceChannel channel, long stallMillis, LongFunction<RuntimeException> tooLarge) {
        this.channel = channel;
        this.stallMillis = stallMillis;
        this.tooLarge = tooLarge;
    }

    @Override
    public int read() throws IOException {
        byte[] one = new byte[1];
        int n = read(one, 0, 1);
        return n < 0 ? -1 : one[0] & 0xff;
    }

    @Override
    public int read(byte[] b, int off, int len) {
        if (len == 0) {
            return 0;
        }
        ByteBuffer into = ByteBuffer.wrap(b, off, len);
        long waitedSince = 0;
        try {
            while (true) {
                int n = channel.read(into);
                if (n != 0) {
                    if (n > 0) {
                        received += n;
                    }
                    return n;
                }
                long now = System.nanoTime();
                if (waitedSince == 0) {
                    waitedSince = now;
                } else if (now - waitedSince >= TimeUnit.MILLISECONDS.toNanos(stallMillis)) {
                    throw new ClientGone("the upload sent nothing for " + stallMillis + " ms", received);
                }
                channel.awaitReadable(stallMillis, TimeUnit.MILLISECONDS);
            }
        } catch (RequestTooBigException e) {
            throw tooLarge.apply(received);
        } catch (IOException e) {
            throw new ClientGone("the client stopped sending (" + e.getMessage() + ")", received);
        }
    }

    long received() {
        return received;
    }
}
