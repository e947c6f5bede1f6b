package dev.dowser.store;

/** A storage failure a person can act on: the message says what went wrong and where. */
public class StoreException extends RuntimeException {

    public StoreException(String message, Throwable cause) {
        super(message, cause);
    }

    public StoreException(String message) {
        super(message);
    }
}
