package dev.dowser.store;

/**
 * The database could not take a lock in time: another transaction holds the same rows (a queue
 * being published, a burst of labels on one record). Nothing was written; the same request a moment
 * later will normally succeed, so this is "busy, try again", not a failure.
 */
public final class BusyException extends StoreException {

    /** Seconds a client should wait before trying again. */
    public static final int RETRY_AFTER_SECONDS = 1;

    BusyException(String what, Throwable cause) {
        super("the database is busy with another change to the same records and could not " + what
                + " in time; nothing was changed, try again in a moment", cause);
    }
}
