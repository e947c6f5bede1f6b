package dev.dowser.store;

/** A write that would break a rule of the stored data, such as a second pool of the same name. */
public final class ConflictException extends StoreException {

    public ConflictException(String message) {
        super(message);
    }
}
