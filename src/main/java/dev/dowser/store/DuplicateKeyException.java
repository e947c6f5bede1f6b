package dev.dowser.store;

/** Two records of one pool with the same id. Lines are those of the import file. */
public final class DuplicateKeyException extends StoreException {

    private final String key;
    private final long firstLine;
    private final long line;

    public DuplicateKeyException(String key, long firstLine, long line) {
        super("duplicate id '" + key + "'" + (firstLine > 0 ? " (first seen on line " + firstLine + ")" : ""));
        this.key = key;
        this.firstLine = firstLine;
        this.line = line;
    }

    public String key() {
        return key;
    }

    public long firstLine() {
        return firstLine;
    }

    public long line() {
        return line;
    }
}
