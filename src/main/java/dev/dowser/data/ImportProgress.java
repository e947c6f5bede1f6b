package dev.dowser.data;

/** Told how far an import has come: records stored so far and bytes of the file read. */
@FunctionalInterface
public interface ImportProgress {

    ImportProgress NONE = (rows, bytes) -> { };

    void update(long rows, long bytesRead);
}
