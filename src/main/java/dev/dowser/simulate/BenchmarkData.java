package dev.dowser.simulate;

import dev.dowser.data.FileFormat;
import dev.dowser.data.Idx;
import dev.dowser.data.ImportSpec;
import dev.dowser.data.LabelledFiles;
import dev.dowser.data.LabelledSet;
import dev.dowser.data.Pca;
import dev.dowser.demo.PumpTraces;
import java.io.BufferedReader;
import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.StringWriter;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.zip.GZIPInputStream;

/**
 * The label-savings benchmark's datasets, read as a pool would read them: UCI's iris, wine,
 * breast cancer and digits as Debian's python3-sklearn ships them, the demo's pump readings, and
 * Fashion-MNIST as Debian's dataset-fashion-mnist ships it (a fixed pool of 60,000 and test set of
 * 10,000 images, projected on 50 principal components of the pool; or, to check that plan, as
 * their 784 pixels standardised as an imported pool's columns are).
 */
public final class BenchmarkData {

    public static final List<String> SKLEARN = List.of("digits", "breast_cancer", "wine", "iris");
    public static final String PUMPS = "pumps";
    public static final String FASHION = "fashion-mnist";
    /** Fashion-MNIST on its raw pixels: what the benchmark's principal components are checked against. */
    public static final String FASHION_PIXELS = "fashion-mnist-pixels";
    /**
     * Fashion-MNIST's standardised pixels (as {@link #FASHION_PIXELS}) projected onto their first
     * 50 principal components without whitening: the pixel plan's geometry in 50 directions.
     */
    public static final String FASHION_PROJECTED = "fashion-mnist-projected";
    public static final int PUMP_RECORDS = 3_000;
    public static final long PUMP_SEED = 7;
    public static final int FASHION_COMPONENTS = 50;
    public static final List<String> FASHION_CLASSES = List.of("T-shirt/top", "Trouser", "Pullover", "Dress",
            "Coat", "Sandal", "Shirt", "Sneaker", "Bag", "Ankle boot");

    /** A dataset: a pool, and a fixed test set or null to hold out a share of the pool per seed. */
    public record Dataset(String name, LabelledSet pool, LabelledSet test) {
    }

    private BenchmarkData() {
    }

    public static Dataset load(String name, Path datasetsDir) {
        if (SKLEARN.contains(name)) {
            return new Dataset(name, sklearn(name, datasetsDir), null);
        }
        return switch (name) {
            case PUMPS -> new Dataset(name, pumps(PUMP_RECORDS, PUMP_SEED), null);
            case FASHION -> fashion(datasetsDir.resolve(FASHION), FASHION_COMPONENTS);
            case FASHION_PIXELS -> fashionPixels(datasetsDir.resolve(FASHION));
            case FASHION_PROJECTED -> fashionProjected(datasetsDir.resolve(FASHION), FASHION_COMPONENTS);
            default -> throw new IllegalArgumentException("no benchmark dataset named '" + name + "': use "
                    + String.join(", ", SKLEARN) + ", " + PUMPS + ", " + FASHION + ", " + FASHION_PIXELS + " or "
                    + FASHION_PROJECTED);
        };
    }

    /**
     * One of sklearn's bundled files, rewritten as a CSV with a header: its format has a first line
     * giving the row count, the feature count and the class names, then rows of features and the
     * class index; digits has no first line and 64 pixel columns then the digit.
     */
    public static OpenCsv sklearnCsv(String name, Path datasetsDir) {
        try (BufferedReader in = reader(datasetsDir, name)) {
            List<String> classes;
            int features;
            if (name.equals("digits")) {
                features = 64;
                classes = List.of("0", "1", "2", "3", "4", "5", "6", "7", "8", "9");
            } else {
                String[] head = in.readLine().split(",");
                features = Integer.parseInt(head[1]);
                classes = Arrays.asList(Arrays.copyOfRange(head, 2, head.length));
            }
            StringBuilder out = new StringBuilder();
            for (int f = 0; f < features; f++) {
                out.append(name.equals("digits") ? "px" : "f").append(f).append(',');
            }
            out.append("label\n");
            String line;
            while ((line = in.readLine()) != null) {
                if (line.isBlank()) {
                    continue;
                }
                String[] v = line.split(",");
                int cls = (int) Double.parseDouble(v[features]);
                out.append(String.join(",", Arrays.copyOfRange(v, 0, features))).append(',').append(classes.get(cls))
                        .append('\n');
            }
            return new OpenCsv(out.toString(), features, List.copyOf(classes));
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read the open dataset " + name + ": " + e.getMessage(), e);
        }
    }

    /** A rewritten open dataset: the CSV text, its feature count and its classes in the file's order. */
    public record OpenCsv(String csv, int features, List<String> classes) {
    }

    static LabelledSet sklearn(String name, Path datasetsDir) {
        OpenCsv open = sklearnCsv(name, datasetsDir);
        return readCsv(open.csv(), ImportSpec.defaults("bench", FileFormat.CSV).withLabel("label")
                .withClasses(open.classes()));
    }

    /** The demo's pump readings, with their true conditions as the labellers' answers. */
    public static LabelledSet pumps(int records, long seed) {
        StringWriter w = new StringWriter();
        try {
            PumpTraces.write(w, records, seed);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return readCsv(w.toString(), ImportSpec.defaults("bench", FileFormat.CSV).withId("reading")
                .withLabel("condition").withFeatures(PumpTraces.FEATURES).withClasses(PumpTraces.CONDITIONS));
    }

    private static LabelledSet readCsv(String csv, ImportSpec spec) {
        return LabelledFiles.read(new ByteArrayInputStream(csv.getBytes(StandardCharsets.UTF_8)), spec);
    }

    /** Fashion-MNIST's training images as the pool and its test images as the test set, on k components. */
    public static Dataset fashion(Path dir, int components) {
        LabelledSet pool = images(dir, "train");
        LabelledSet test = images(dir, "t10k");
        Pca pca = Pca.fit(pool.x(), pool.rows(), pool.cols(), components);
        return new Dataset(FASHION, pca.project(pool), pca.project(test));
    }

    /**
     * Fashion-MNIST on its 784 pixels, each standardised with the pool's mean and population SD as
     * an imported pool's numeric columns are ({@code FeatureSchema}: an SD of 0, the blank corners,
     * leaves x - mean); the test images with the pool's figures.
     */
    public static Dataset fashionPixels(Path dir) {
        LabelledSet pool = images(dir, "train");
        LabelledSet test = images(dir, "t10k");
        int cols = pool.cols();
        double[] mean = new double[cols];
        double[] square = new double[cols];
        float[] x = pool.x();
        for (int i = 0; i < pool.rows(); i++) {
            for (int j = 0; j < cols; j++) {
                double v = x[i * cols + j];
                mean[j] += v;
                square[j] += v * v;
            }
        }
        double[] sd = new double[cols];
        for (int j = 0; j < cols; j++) {
            mean[j] /= pool.rows();
            sd[j] = Math.sqrt(Math.max(0, square[j] / pool.rows() - mean[j] * mean[j]));
        }
        return new Dataset(FASHION_PIXELS, standardised(pool, mean, sd), standardised(test, mean, sd));
    }

    /**
     * The standardised pixels on their first k principal components, not whitened: a record's
     * projection keeps its distances to others in the components' span, as the app would see the
     * 784 standardised columns (the 50 keep 628 of their variance), while whitening would stretch
     * the 50th component (variance 1.7 against the first one's 173, FashionMnistTest) as far as the first.
     */
    public static Dataset fashionProjected(Path dir, int components) {
        Dataset pixels = fashionPixels(dir);
        LabelledSet pool = pixels.pool();
        Pca pca = Pca.fit(pool.x(), pool.rows(), pool.cols(), components, false);
        return new Dataset(FASHION_PROJECTED, pca.project(pool), pca.project(pixels.test()));
    }

    private static LabelledSet standardised(LabelledSet set, double[] mean, double[] sd) {
        int cols = set.cols();
        float[] z = new float[set.x().length];
        for (int i = 0; i < set.rows(); i++) {
            for (int j = 0; j < cols; j++) {
                double d = set.x()[i * cols + j] - mean[j];
                z[i * cols + j] = (float) (sd[j] > 0 ? d / sd[j] : d);
            }
        }
        return new LabelledSet(z, set.labels(), set.poolRows(), cols, set.classes());
    }

    private static LabelledSet images(Path dir, String part) {
        if (!Files.isRegularFile(dir.resolve(".complete"))) {
            throw new IllegalStateException("Fashion-MNIST is missing from " + dir
                    + "; ./dowser test unpacks it from Debian's dataset-fashion-mnist");
        }
        Idx images = Idx.read(dir.resolve(part + "-images-idx3-ubyte.gz"));
        int[] labels = Idx.read(dir.resolve(part + "-labels-idx1-ubyte.gz")).labels(FASHION_CLASSES.size());
        if (labels.length != images.items()) {
            throw new IllegalStateException(part + ": " + images.items() + " images but " + labels.length + " labels");
        }
        long[] rows = new long[labels.length];
        for (int i = 0; i < rows.length; i++) {
            rows[i] = i;
        }
        return new LabelledSet(images.values(), labels, rows, images.itemSize(), FASHION_CLASSES);
    }

    private static BufferedReader reader(Path dir, String name) throws IOException {
        String file = switch (name) {
            case "iris" -> "iris.csv";
            case "wine" -> "wine_data.csv";
            case "breast_cancer" -> "breast_cancer.csv";
            case "digits" -> "digits.csv.gz";
            default -> throw new IllegalArgumentException("no open dataset named " + name);
        };
        InputStream raw = Files.newInputStream(dir.resolve(file));
        if (file.endsWith(".gz")) {
            raw = new GZIPInputStream(raw);
        }
        return new BufferedReader(new InputStreamReader(raw, StandardCharsets.UTF_8));
    }
}
