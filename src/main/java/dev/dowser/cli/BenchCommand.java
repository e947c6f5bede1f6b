package dev.dowser.cli;

import dev.dowser.data.FileFormat;
import dev.dowser.data.ImportProgress;
import dev.dowser.data.ImportResult;
import dev.dowser.data.ImportSpec;
import dev.dowser.data.Importer;
import dev.dowser.simulate.Simulation;
import dev.dowser.store.Database;
import java.io.IOException;
import java.io.InputStream;
import java.io.Writer;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.time.Clock;
import java.util.SplittableRandom;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

@Command(name = "bench", mixinStandardHelpOptions = true,
        description = {"Measures this machine and prints key=value lines.",
            "Every suite that stores records makes its own H2 databases under --work; none runs on PostgreSQL.",
            "",
            "import: a generated CSV of N rows x 64 numeric features into a fresh pool, at N/10 and at N in"
                + " the same run; rows per second, the peak heap (what the collector let the heap grow to) and"
                + " the live heap (the most still in use just after a collection), so memory that grows with"
                + " the file would show. Then the same number of fields in 64, 2,000, 10,000 and 20,000 columns:"
                + " fields per second and each against 64 columns (1.0 when the cost is linear in the columns).",
            "upload: a generated CSV of 1 GiB (128 MiB with --quick) sent through the API into the server run as"
                + " its own process with -Xmx512m: seconds to send, to import and in all, and the server's peak"
                + " resident memory.",
            "sgemm: square single-precision products through the BLAS the model uses, one per core at once"
                + " (the machine's throughput) and on one thread.",
            "score: BALD and friends over pools of shapes (a) 100k x 64-128-10 with 64 draws, (b) 1M x"
                + " 64-128-10 with 32 draws, (c) 100k x 784-256-10 with 32 draws; GFLOP/s count the matrix"
                + " products only, 2 N S (d h + h C).",
            "sampler: preconditioned SGLD on a 64-128-10 network, 1000 labelled rows, mini-batch 128, 4"
                + " chains: chain-steps per second, the share of sgemm reached, and a warm round timed.",
            "round: the app's round step at a new pool's defaults (strategy, temperature, kernel rule, draws) on a"
                + " 100,000-row pool with 1000 labels: continue the chains, score the other 99,000 records, pick a batch.",
            "desk: 20 simulated labellers on loopback submit a label and ask for the next record (200 ms"
                + " apart) while rounds run on a 100,000-row pool (batch 100), with commits written before they"
                + " return and delayed (H2's default) in the same run: p50 and p99 of submit-and-next, their ratio,"
                + " and the time from a batch's last label to its new queue being served; then the empty answers"
                + " while records remain with 1 and 20 labellers on the defaults, 20 with BatchBALD at 20 a round"
                + " and 50 on the defaults. About 4 minutes, 2 with --quick.",
            "durability: the server as its own process, 8 labellers, a reviewer and an admin writing as fast as"
                + " they can, killed with SIGKILL 25 times (5 with --quick) at random moments (after 250 to 750"
                + " acknowledged writes, then up to 0.3 s) and restarted: every"
                + " acknowledged label, withdrawal, review, settings and account change must be there afterwards;"
                + " prints the counts acknowledged and lost, and the desk's empty answers across the kills (the pool"
                + " holds more records than the campaign writes).",
            "labels (only when named): the label-savings benchmark, simulate on digits, breast cancer, wine, iris,"
                + " the demo's pumps and Fashion-MNIST (pool 60,000, test 10,000, 50 principal components, 10,000"
                + " records sampled and scored per round) with"
                + " paired seeds: labels to each target, random's labels over the strategy's with 90%% bootstrap"
                + " intervals, area-under-the-curve gains; curves and a table (labels.md) in --labels-out. Hours.",
            "stopping (only when named): the stopping rule's proof, simulate on digits with the default strategy and"
                + " settings, 10 paired seeds, batches of 10 up to 600 labels: seeds in which the rule fired, test"
                + " accuracy at the stop and at 600 (medians), the median gap with its 90%% bootstrap interval over"
                + " seeds, the share of rounds whose estimate held the test accuracy, and stopping_holds (fired in"
                + " every seed, within a point, 90%% of rounds held); curves in --labels-out/stopping/digits. About half an"
                + " hour on 2 quiet cores.",
            "fuzz: 100,200 generated inputs (3,000 with --quick) against the real server: every JSON body and"
                + " heads of files to preview (two fifths each), files to import (a fifth, last); our seeded"
                + " generators in the test sources, run through Maven (a source folder is needed). Counts per status and"
                + " the root seed; any 500, partial write or Java message in a refusal fails it. About half an hour on 2 quiet cores."})
final class BenchCommand implements Callable<Integer> {

    @Spec
    CommandSpec spec;

    static final int FEATURES = 64;
    static final int FULL_ROWS = 1_000_000;
    static final int QUICK_ROWS = 100_000;
    static final long SEED = 20_261_202L;

    @Option(names = "--quick", description = "Smaller sizes, for a first look (" + QUICK_ROWS + " rows).")
    boolean quick;

    @Option(names = "--rows", paramLabel = "N", description = "Rows of the import benchmark (default: "
            + FULL_ROWS + ", or " + QUICK_ROWS + " with --quick).")
    Integer rows;

    @Option(names = "--work", paramLabel = "DIR", description = "Scratch folder (default: a new temporary folder).")
    Path work;

    @Option(names = "--only", split = ",", paramLabel = "SUITE",
            description = "Suites to run: sgemm, score, sampler, round, desk, durability, import, upload, fuzz, labels,"
                    + " stopping (default: all but labels and stopping).")
    java.util.List<String> only;

    @Option(names = "--datasets", split = ",", paramLabel = "NAME",
            description = "labels: datasets (default: digits,breast_cancer,wine,iris,pumps,fashion-mnist; fashion-mnist-pixels, its"
                    + " raw pixels to check the principal components against, and fashion-mnist-projected, the"
                    + " standardised pixels on 50 components without whitening, only when named).")
    java.util.List<String> datasets = java.util.List.of("digits", "breast_cancer", "wine", "iris", "pumps",
            "fashion-mnist");

    @Option(names = "--strategies", split = ",", paramLabel = "S",
            description = "labels: strategies besides random, the first one in the table (default: default).")
    java.util.List<String> strategies = java.util.List.of(dev.dowser.rounds.Strategy.DEFAULT_WORD);

    @Option(names = "--seeds", defaultValue = "" + Simulation.Plan.DEFAULT_SEEDS, paramLabel = "N", description = "labels, stopping: paired seeds (default: ${DEFAULT-VALUE}).")
    int seeds;

    @Option(names = "--datasets-dir", defaultValue = "target/datasets", paramLabel = "DIR",
            description = "labels, stopping: where ./dowser test unpacked the open datasets (default: ${DEFAULT-VALUE}).")
    Path datasetsDir;

    @Option(names = "--labels-out", defaultValue = "target/bench-labels", paramLabel = "DIR",
            description = "labels: folder for each dataset's curves and the table; stopping: its curves in the"
                    + " folder's stopping/digits (default: ${DEFAULT-VALUE}).")
    Path labelsOut;

    @Option(names = "--budget", paramLabel = "N",
            description = "labels: labels at which every dataset's runs stop (default: each dataset's own budget).")
    Integer budget;

    @Option(names = "--candidates", paramLabel = "N",
            description = "labels: records scored per round, drawn uniformly from the unlabelled ones afresh each round;"
                    + " 0 scores every record, as the server does (default: each dataset's plan: "
                    + dev.dowser.simulate.LabelSavings.FASHION_CANDIDATES + " on fashion-mnist, every record elsewhere).")
    Integer candidates;

    @Option(names = "--random-from", paramLabel = "DIR",
            description = "labels: random's curves from an earlier run's --labels-out (DIR/<dataset>/curves.csv) instead of"
                    + " running random again: a random curve depends only on its seed, so the same version with the same"
                    + " settings draws the same curve. That run must cover these seeds and this budget; when it went"
                    + " further, the savings are also given against its whole curves (a strategy can stop early).")
    Path randomFrom;

    @Option(names = "--cold-start", defaultValue = dev.dowser.rounds.PoolSettings.DEFAULT_COLD_START_WORD,
            paramLabel = "kmeans++|typiclust", description = "labels: how the first batch is spread over the pool"
                    + " (default: ${DEFAULT-VALUE}).")
    String coldStart;

    @picocli.CommandLine.Mixin
    SamplerOptions sampler;

    private boolean wants(String suite) {
        return only == null ? !suite.equals("labels") && !suite.equals("stopping") : only.contains(suite);
    }

    @Override
    public Integer call() throws Exception {
        int n = rows != null ? rows : quick ? QUICK_ROWS : FULL_ROWS;
        if (n < 10) {
            throw new IllegalArgumentException("--rows must be at least 10, got " + n);
        }
        java.io.PrintWriter out = spec.commandLine().getOut();
        out.printf("cores=%d%nmax_heap_mib=%d%nblas=%s%n", Runtime.getRuntime().availableProcessors(),
                Runtime.getRuntime().maxMemory() >> 20, dev.dowser.blas.Blas.implementation());
        out.flush();
        // The import runs first, on a fresh heap, so the pools the other suites build do not weigh on it.
        if (wants("import")) {
            Path dir = work != null ? Files.createDirectories(work) : Files.createTempDirectory("dowser-bench-");
            try {
                double csv = importSuite(out, dir, n / 10, "small", FileFormat.CSV);
                double jsonl = importSuite(out, dir, n / 10, "small_jsonl", FileFormat.JSONL);
                out.printf("import_jsonl_to_csv_speed=%.2f%n", jsonl / csv);
                importSuite(out, dir, n, "full", FileFormat.CSV);
                WideImportBench.run(out, dir, quick);
            } finally {
                Folders.deleteTree(dir);
            }
        }
        if (wants("upload")) {
            Path dir = work != null ? Files.createDirectories(work.resolve("upload")) : Files.createTempDirectory("dowser-upload-");
            try {
                UploadBench.run(out, dir, quick);
            } finally {
                Folders.deleteTree(dir);
            }
        }
        double sgemm = Double.NaN;
        if (wants("sgemm") || wants("sampler") || wants("score")) {
            double one = SamplerBench.sgemmGflops(quick ? 1024 : 2048);
            sgemm = ScoreBench.machineSgemmGflops(quick ? 1024 : 2048);
            out.printf("sgemm_one_thread_gflops=%.1f%nsgemm_gflops=%.1f%n", one, sgemm);
            out.flush();
        }
        if (wants("score")) {
            ScoreBench.run(out, sgemm, quick);
        }
        if (wants("sampler")) {
            SamplerBench.run(out, sgemm, quick);
            out.flush();
        }
        if (wants("round")) {
            RoundBench.run(out, quick);
        }
        if (wants("fuzz")) {
            FuzzBench.run(out, quick);
        }
        if (wants("labels")) {
            LabelsBench.run(out, datasetsDir, datasets, strategies.stream().map(dev.dowser.rounds.Strategy::parse)
                    .distinct().toList(), seeds, sampler.config(), dev.dowser.rounds.PoolSettings.defaults()
                    .withColdStart(dev.dowser.acquire.ColdStart.Method.parse(coldStart)), budget, candidates,
                    randomFrom, labelsOut);
        }
        if (wants("stopping")) {
            StopBench.run(out, datasetsDir, seeds, sampler.config(), labelsOut.resolve("stopping"));
        }
        if (wants("desk")) {
            Path dir = work != null ? Files.createDirectories(work.resolve("desk")) : Files.createTempDirectory("dowser-desk-");
            try {
                DeskBench.run(out, dir, quick);
            } finally {
                Folders.deleteTree(dir);
            }
        }
        if (wants("durability")) {
            Path dir = work != null ? Files.createDirectories(work.resolve("durability"))
                    : Files.createTempDirectory("dowser-durability-");
            // Kept when the campaign fails: its server log and database show why.
            durability(out, dir, quick);
            Folders.deleteTree(dir);
        }
        return 0;
    }

    static final int DURABILITY_KILLS = 25;
    static final int DURABILITY_QUICK_KILLS = 5;
    static final int DURABILITY_LABELLERS = 8;
    /** Writes acknowledged in one life of the server before it is killed: 25 kills give about 12,500. */
    static final int DURABILITY_MIN_WRITES = 250;
    static final int DURABILITY_MAX_WRITES = 750;

    private static void durability(java.io.PrintWriter out, Path dir, boolean quick) throws Exception {
        KillCampaign campaign = new KillCampaign(quick ? DURABILITY_QUICK_KILLS : DURABILITY_KILLS, DURABILITY_LABELLERS,
                DURABILITY_MIN_WRITES, DURABILITY_MAX_WRITES, SEED);
        KillCampaign.Report r = campaign.run(dir, ServerProcess.sameJava("-Xmx1g"), out);
        out.printf("durability_kills=%d%ndurability_acknowledged=%d%ndurability_lost=%d%n", campaign.kills(),
                r.check().acknowledged(), r.check().lost());
        r.check().counts().forEach((kind, c) -> out.printf("durability_%s_acknowledged=%d%ndurability_%s_lost=%d%n",
                kind.name().toLowerCase(java.util.Locale.ROOT), c[0], kind.name().toLowerCase(java.util.Locale.ROOT), c[1]));
        out.printf("durability_server_errors=%d%ndurability_busy=%d%ndurability_timeouts=%d%n"
                + "durability_start_median_s=%.2f%n", r.serverErrors(), r.busy(), r.timeouts(),
                r.startSeconds().stream().sorted().toList().get(r.startSeconds().size() / 2));
        out.printf("durability_records=%d%ndurability_desk_offered=%d%ndurability_desk_empty=%d%n"
                + "durability_requests_resent=%d%n", campaign.records(), r.offered(), r.empty(), r.dropped());
        if (r.firstEmpty() != null) {
            out.println("durability_desk_first_empty=" + r.firstEmpty());
        }
        r.check().missing().stream().limit(10).forEach(a -> out.println("durability_missing=" + a));
        out.flush();
    }

    /** Imports n generated rows in {@code format}; prints the figures under {@code tag}, returns rows per second. */
    private static double importSuite(java.io.PrintWriter out, Path dir, int n, String tag, FileFormat format)
            throws IOException {
        Path csv = dir.resolve("bench-" + n + "." + format.word());
        writeRows(csv, n, format);
        // Flush the generated file to disk first, so its write-back does not run during the import.
        try (FileChannel ch = FileChannel.open(csv, StandardOpenOption.WRITE)) {
            ch.force(true);
        }
        Path dataDir = dir.resolve("db-" + tag);
        try (Database db = Database.open(dataDir, Clock.systemUTC())) {
            System.gc();
            resetPeaks();
            ImportResult r;
            long live;
            try (HeapAfterGc watch = HeapAfterGc.start(); InputStream in = Files.newInputStream(csv)) {
                r = new Importer(db).run(in, csv.getFileName().toString(),
                        ImportSpec.defaults("bench", format).withId("id"), ImportProgress.NONE);
                live = watch.maxBytes();
            }
            long peak = peakHeapBytes();
            out.printf("import_%s_rows=%d%nimport_%s_mib=%.1f%nimport_%s_seconds=%.2f%n"
                            + "import_%s_rows_per_s=%.0f%nimport_%s_peak_heap_mib=%.0f%nimport_%s_live_heap_mib=%.0f%n",
                    tag, r.records(), tag, Files.size(csv) / 1048576.0, tag, r.seconds(), tag, r.recordsPerSecond(),
                    tag, peak / 1048576.0, tag, live / 1048576.0);
            Files.delete(csv);
            return r.recordsPerSecond();
        }
    }

    /**
     * n rows, as CSV or as JSON Lines ({"id": "r0", "f0": 0.1234, ...}), the same from the same seed: an id,
     * then 64 Gaussian features written with four decimals.
     */
    static void writeRows(Path file, int n, FileFormat format) throws IOException {
        boolean csv = format == FileFormat.CSV;
        SplittableRandom rng = new SplittableRandom(SEED);
        try (Writer w = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
            StringBuilder line = new StringBuilder(1024);
            if (csv) {
                w.write(header(line).append('\n').toString());
            }
            for (int i = 0; i < n; i++) {
                line.setLength(0);
                line.append(csv ? "r" : "{\"id\":\"r").append(i).append(csv ? "" : "\"");
                for (int f = 0; f < FEATURES; f++) {
                    line.append(csv ? "," : ",\"f" + f + "\":");
                    appendFixed4(line, rng.nextGaussian() * (1 + f % 5) + f);
                }
                w.write(line.append(csv ? "\n" : "}\n").toString());
            }
        }
    }

    /** The header of the benchmarks' generated files: id, then f0 to f63. */
    static StringBuilder header(StringBuilder line) {
        line.append("id");
        for (int f = 0; f < FEATURES; f++) {
            line.append(",f").append(f);
        }
        return line;
    }

    static void appendFixed4(StringBuilder s, double x) {
        long scaled = Math.round(x * 10_000);
        if (scaled < 0) {
            s.append('-');
            scaled = -scaled;
        }
        s.append(scaled / 10_000).append('.');
        long frac = scaled % 10_000;
        for (long d = 1_000; d > 0; d /= 10) {
            s.append((char) ('0' + (frac / d) % 10));
        }
    }

    private static void resetPeaks() {
        for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
            if (pool.getType() == MemoryType.HEAP) {
                pool.resetPeakUsage();
            }
        }
    }

    /** Sum of each heap pool's peak: an upper bound on the heap in use at any one time. */
    private static long peakHeapBytes() {
        long sum = 0;
        for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
            if (pool.getType() == MemoryType.HEAP) {
                sum += pool.getPeakUsage().getUsed();
            }
        }
        return sum;
    }
}
