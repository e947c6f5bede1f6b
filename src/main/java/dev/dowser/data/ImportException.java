package dev.dowser.data;

/**
 * Why an import stopped, naming the line and column where there is one. An import that throws
 * this has left the database exactly as it was.
 */
public final class ImportException extends RuntimeException {

    private final long line;
    private final String column;

    public ImportException(long line, String column, String problem) {
        this(line, column, problem, null);
    }

    public ImportException(long line, String column, String problem, Throwable cause) {
        super(where(line, column) + problem, cause);
        this.line = line;
        this.column = column;
    }

    /** A problem with the whole file or the request, not with one line. */
    public static ImportException of(String problem) {
        return new ImportException(0, null, problem);
    }

    private static String where(long line, String column) {
        StringBuilder s = new StringBuilder();
        if (line > 0) {
            s.append("line ").append(line);
        }
        if (column != null) {
            s.append(s.length() > 0 ? ", " : "").append("column '").append(column).append('\'');
        }
        return s.length() > 0 ? s.append(": ").toString() : "";
    }

    /** The line of the file, counting from 1; 0 when the problem is not on one line. */
    public long line() {
        return line;
    }

    /** The column's name, or null when the problem is not in one column. */
    public String column() {
        return column;
    }
}
