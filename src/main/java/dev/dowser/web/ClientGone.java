package dev.dowser.web;

/**
 * A client stopped sending its request body: it went away, or sent nothing for too long. Nothing
 * can be answered; {@link Errors} logs one line and closes the connection.
 */
final class ClientGone extends RuntimeException {

    private final long received;

    ClientGone(String why, long received) {
        super(why, null, false, false);
        this.received = received;
    }

    /** Bytes of the body that did arrive. */
    long received() {
        return received;
    }
}
