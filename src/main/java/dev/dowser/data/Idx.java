package dev.dowser.data;

import java.io.BufferedInputStream;
import java.io.DataInputStream;
import java.io.EOFException;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.zip.GZIPInputStream;

/**
 * LeCun's IDX format, in which MNIST and Fashion-MNIST are shipped (LeCun, Cortes & Burges, "The
 * MNIST database of handwritten digits", the file format section): a magic number of two zero
 * bytes, a type code (0x08 unsigned byte, 0x09 signed byte, 0x0B short, 0x0C int, 0x0D float, 0x0E
 * double) and the number of dimensions; then each dimension's size as a big-endian 32-bit integer;
 * then the values in row-major order, big-endian. A file ending in {@code .gz} is read through gzip.
 *
 * @param dims   the size of each dimension; the first counts the items
 * @param values every value, row-major, as float
 */
public record Idx(int[] dims, float[] values) {

    static final int UNSIGNED_BYTE = 0x08;
    static final int SIGNED_BYTE = 0x09;
    static final int SHORT = 0x0B;
    static final int INT = 0x0C;
    static final int FLOAT = 0x0D;
    static final int DOUBLE = 0x0E;

    /** Items in the file: the first dimension's size. */
    public int items() {
        return dims[0];
    }

    /** Values per item: the product of the other dimensions' sizes. */
    public int itemSize() {
        int n = 1;
        for (int d = 1; d < dims.length; d++) {
            n *= dims[d];
        }
        return n;
    }

    public static Idx read(Path file) {
        try (InputStream raw = Files.newInputStream(file)) {
            InputStream in = file.getFileName().toString().endsWith(".gz") ? new GZIPInputStream(raw, 1 << 16) : raw;
            return read(in, file.getFileName().toString());
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read " + file + ": " + e.getMessage(), e);
        }
    }

    /** Reads an IDX stream; {@code name} names it in messages. */
    public static Idx read(InputStream input, String name) throws IOException {
        DataInputStream in = new DataInputStream(new BufferedInputStream(input, 1 << 16));
        try {
            int zero1 = in.readUnsignedByte();
            int zero2 = in.readUnsignedByte();
            int type = in.readUnsignedByte();
            int rank = in.readUnsignedByte();
            if (zero1 != 0 || zero2 != 0 || !List.of(UNSIGNED_BYTE, SIGNED_BYTE, SHORT, INT, FLOAT, DOUBLE).contains(type)
                    || rank < 1) {
                throw new ImportException(0, null, name + " is not an IDX file: its magic number is "
                        + String.format("0x%02x%02x%02x%02x", zero1, zero2, type, rank));
            }
            int[] dims = new int[rank];
            long total = 1;
            for (int d = 0; d < rank; d++) {
                dims[d] = in.readInt();
                if (dims[d] < 0) {
                    throw new ImportException(0, null, name + ": dimension " + d + " has a negative size");
                }
                total *= dims[d];
            }
            if (total > Integer.MAX_VALUE - 16) {
                throw new ImportException(0, null, name + " holds " + total + " values, " + Arrays.toString(dims)
                        + ", more than one array can hold");
            }
            float[] values = new float[(int) total];
            if (type == UNSIGNED_BYTE) {
                // Images are unsigned bytes: read them a chunk at a time rather than a call per pixel.
                byte[] chunk = new byte[1 << 16];
                for (int at = 0; at < values.length; at += chunk.length) {
                    int n = Math.min(chunk.length, values.length - at);
                    in.readFully(chunk, 0, n);
                    for (int i = 0; i < n; i++) {
                        values[at + i] = chunk[i] & 0xFF;
                    }
                }
                return new Idx(dims, values);
            }
            for (int i = 0; i < values.length; i++) {
                values[i] = switch (type) {
                    case UNSIGNED_BYTE -> in.readUnsignedByte();
                    case SIGNED_BYTE -> in.readByte();
                    case SHORT -> in.readShort();
                    case INT -> in.readInt();
                    case FLOAT -> in.readFloat();
                    default -> (float) in.readDouble();
                };
            }
            return new Idx(dims, values);
        } catch (EOFException e) {
            throw new ImportException(0, null, name + " ends before the values its header announces");
        }
    }

    /** The values as class indices: one per item, each a whole number from 0 to {@code classes} - 1. */
    public int[] labels(int classes) {
        if (dims.length != 1) {
            throw new IllegalArgumentException("labels are a one-dimensional IDX file, this has dimensions "
                    + Arrays.toString(dims));
        }
        int[] y = new int[values.length];
        for (int i = 0; i < y.length; i++) {
            float v = values[i];
            if (v != Math.rint(v) || v < 0 || v >= classes) {
                throw new ImportException(i + 1, null, "label " + v + " is not a class index below " + classes);
            }
            y[i] = (int) v;
        }
        return y;
    }
}
