package dev.dowser.records;

/** A stored record block does not read back as one: damaged, or written by a newer Dowser. */
public final class DamagedBlockException extends RuntimeException {

    public DamagedBlockException(String message) {
        super(message);
    }
}
