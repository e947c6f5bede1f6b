package dev.dowser.data;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import dev.dowser.TestSupport;
import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.DataOutputStream;
import java.io.IOException;
import java.nio.file.Path;
import java.util.Arrays;
import org.junit.jupiter.api.Test;

/**
 * The IDX reader against the format's documented header (LeCun, Cortes & Burges, the MNIST
 * page's file format section) and the files Debian's dataset-fashion-mnist ships: 60,000 training
 * and 10,000 test images of 28 x 28 unsigned bytes, and their labels, whose first values in the
 * files are 9, 0, 0, 3, 0, 2, 7, 2, 5, 5, 0, 9 (training) and 9, 2, 1, 1, 6 (test); the class
 * names are those of the package's README (0 T-shirt/top ... 9 Ankle boot).
 */
class IdxTest {

    static Path fashion(String file) {
        return TestSupport.datasetsDir().resolve("fashion-mnist").resolve(file);
    }

    @Test
    void fashionMnistAsShipped() {
        Idx labels = Idx.read(fashion("train-labels-idx1-ubyte.gz"));
        assertArrayEquals(new int[] {60_000}, labels.dims());
        int[] y = labels.labels(10);
        assertArrayEquals(new int[] {9, 0, 0, 3, 0, 2, 7, 2, 5, 5, 0, 9}, Arrays.copyOf(y, 12));
        // The training set is balanced: 6,000 images of each class (the package's README).
        int[] counts = new int[10];
        for (int v : y) {
            counts[v]++;
        }
        for (int c : counts) {
            assertEquals(6_000, c);
        }
        assertArrayEquals(new int[] {9, 2, 1, 1, 6}, Arrays.copyOf(Idx.read(fashion("t10k-labels-idx1-ubyte.gz"))
                .labels(10), 5));
        Idx images = Idx.read(fashion("t10k-images-idx3-ubyte.gz"));
        assertArrayEquals(new int[] {10_000, 28, 28}, images.dims());
        assertEquals(784, images.itemSize());
        double max = 0;
        for (float v : images.values()) {
            max = Math.max(max, v);
        }
        assertEquals(255, max, "unsigned bytes reach 255");
    }

    @Test
    void everyTypeCodeAndBadHeaders() throws IOException {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        DataOutputStream out = new DataOutputStream(bytes);
        // 0x0D: float, 2 dimensions, 2 x 3, big-endian.
        out.write(new byte[] {0, 0, 0x0D, 2});
        out.writeInt(2);
        out.writeInt(3);
        for (int i = 0; i < 6; i++) {
            out.writeFloat(i * 0.5f - 1);
        }
        Idx f = Idx.read(new ByteArrayInputStream(bytes.toByteArray()), "floats");
        assertArrayEquals(new float[] {-1, -0.5f, 0, 0.5f, 1, 1.5f}, f.values());
        assertEquals(2, f.items());
        bytes.reset();
        out.write(new byte[] {0, 0, 0x0B, 1});
        out.writeInt(2);
        out.writeShort(-300);
        out.writeShort(7);
        assertArrayEquals(new float[] {-300, 7}, Idx.read(new ByteArrayInputStream(bytes.toByteArray()), "shorts")
                .values());
        ImportException bad = assertThrows(ImportException.class, () -> Idx.read(new ByteArrayInputStream(
                new byte[] {'P', 'K', 3, 4}), "photo.zip"));
        assertEquals("photo.zip is not an IDX file: its magic number is 0x504b0304", bad.getMessage());
        ImportException shortFile = assertThrows(ImportException.class, () -> Idx.read(new ByteArrayInputStream(
                new byte[] {0, 0, 8, 1, 0, 0, 0, 5, 1, 2}), "cut.idx"));
        assertEquals("cut.idx ends before the values its header announces", shortFile.getMessage());
        assertThrows(ImportException.class, () -> new Idx(new int[] {2}, new float[] {1, 10}).labels(10));
    }
}
