package dev.dowser.store;

/** A named thing (pool, record) that does not exist. */
public final class NotFoundException extends StoreException {

    public NotFoundException(String message) {
        super(message);
    }
}
