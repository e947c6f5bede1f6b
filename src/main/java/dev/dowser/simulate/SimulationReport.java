package dev.dowser.simulate;

import dev.dowser.rounds.Strategy;
import dev.dowser.stats.AccuracyEstimate;
import dev.dowser.stats.Bootstrap;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.Writer;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * Writes a simulation's curves (CSV, SVG, PNG) and its summary: a table of mean test accuracy by
 * labels, then {@code key=value} lines a script can read (accuracy and NLL at fixed counts as the
 * median over seeds with its quartiles, so the centre lies inside the band). Every count printed is one that occurred;
 * a target not reached prints {@code none}; an interval end that some replicates never reach prints
 * {@code inf}; nothing prints NaN.
 */
public final class SimulationReport {

    public static final String CSV = "curves.csv";
    public static final String SVG = "curves.svg";
    public static final String PNG = "curves.png";
    static final String HEADER = "strategy,seed,labels,accuracy,nll,ece,seconds,agreement,settled,estimate,estimate_lower,"
            + "estimate_upper";
    /** Label counts at which accuracy and NLL are reported (the nearest on the grid), besides the budget. */
    static final int[] FIXED_COUNTS = {50, 100, 200, 500, 1000};

    private SimulationReport() {
    }

    public static void write(Path dir, String title, List<Simulation.Point> points, Simulation.Plan plan)
            throws IOException {
        Files.createDirectories(dir);
        try (Writer w = Files.newBufferedWriter(dir.resolve(CSV))) {
            w.write(HEADER + "\n");
            for (Simulation.Point p : points) {
                AccuracyEstimate e = p.estimate() != null && p.estimate().known() ? p.estimate() : null;
                w.write(String.format(Locale.ROOT, "%s,%d,%d,%.5f,%.5f,%.5f,%.3f,%s,%b,%s,%s,%s%n", p.strategy().word(),
                        p.seed(), p.labels(), p.accuracy(), p.nll(), p.ece(), p.seconds(), cell(p.agreement()),
                        p.settled(), e == null ? "" : cell(e.accuracy()), e == null ? "" : cell(e.lower()),
                        e == null ? "" : cell(e.upper())));
            }
        }
        CurvePlot.Figure figure = new CurvePlot.Figure(title + ": test accuracy, median of " + plan.seeds()
                + " seeds, band: middle half", LearningCurves.of(points, plan.strategies(), plan.seeds()));
        CurvePlot.writeSvg(dir.resolve(SVG), figure);
        CurvePlot.writePng(dir.resolve(PNG), figure);
    }

    /**
     * {@code strategy}'s points from a curves.csv that {@link #write} wrote: every column but the
     * estimate's label count, which the file does not keep (1 stands for "known"; the reports read
     * only the estimate and its interval).
     */
    static List<Simulation.Point> read(Path csv, Strategy strategy) throws IOException {
        List<String> lines = Files.readAllLines(csv);
        if (lines.isEmpty() || !lines.get(0).equals(HEADER)) {
            throw new IllegalArgumentException(csv + " is not the curves.csv of a simulation: its first line must read "
                    + HEADER);
        }
        List<Simulation.Point> out = new ArrayList<>();
        for (int i = 1; i < lines.size(); i++) {
            String[] c = lines.get(i).split(",", -1);
            if (c.length != 12) {
                throw new IllegalArgumentException(csv + ", line " + (i + 1) + ": 12 fields expected, found " + c.length);
            }
            if (!c[0].equals(strategy.word())) {
                continue;
            }
            AccuracyEstimate estimate = c[9].isEmpty() ? null
                    : new AccuracyEstimate(Double.parseDouble(c[9]), Double.parseDouble(c[10]), Double.parseDouble(c[11]),
                    1, Double.NaN);
            out.add(new Simulation.Point(strategy, Integer.parseInt(c[1]), Integer.parseInt(c[2]),
                    Double.parseDouble(c[3]), Double.parseDouble(c[4]), Double.parseDouble(c[5]), Double.parseDouble(c[6]),
                    c[7].isEmpty() ? Double.NaN : Double.parseDouble(c[7]), Boolean.parseBoolean(c[8]), estimate));
        }
        return out;
    }

    /** The table and the figures; see the class comment. */
    public static void summary(PrintWriter out, List<Simulation.Point> points, Simulation.Plan plan,
                               List<Double> targets) {
        LearningCurves lc = LearningCurves.of(points, plan.strategies(), plan.seeds());
        List<Strategy> strategies = lc.strategies();
        StringBuilder head = new StringBuilder(String.format("%-8s", "labels"));
        strategies.forEach(s -> head.append(String.format(" %10s", s.word())));
        out.println(head + "   (mean test accuracy over " + lc.seeds() + " seeds)");
        int[] grid = lc.grid();
        for (int g = 0; g < grid.length; g++) {
            StringBuilder row = new StringBuilder(String.format("%-8d", grid[g]));
            for (Strategy s : strategies) {
                row.append(String.format(Locale.ROOT, " %10.3f", lc.meanCurve(s)[g]));
            }
            out.println(row);
        }
        boolean withRandom = strategies.contains(Strategy.RANDOM);
        for (double target : targets) {
            String t = targetName(target);
            for (Strategy s : strategies) {
                String key = t + "_" + s.word();
                out.printf("labels_to_%s=%s%n", key, count(lc.labelsToReach(s, target)));
                out.printf("labels_to_%s_interval=%s%n", key, interval(lc.labelsToReachInterval(s, target), "%.0f"));
                out.printf("seeds_reaching_%s=%d/%d%n", key, lc.seedsReaching(s, target), lc.seeds());
                out.printf("median_first_%s=%s%n", key, count(lc.medianFirst(s, target)));
                if (withRandom && s != Strategy.RANDOM) {
                    double ratio = lc.savingsRatio(s, Strategy.RANDOM, target);
                    out.printf("savings_%s=%s%n", key, number(ratio, "%.2f"));
                    out.printf("savings_%s_interval=%s%n", key, Double.isNaN(ratio) ? "none"
                            : interval(lc.savingsRatioInterval(s, Strategy.RANDOM, target), "%.2f"));
                }
            }
        }
        for (Strategy s : strategies) {
            out.printf(Locale.ROOT, "auc_%s=%.4f%n", s.word(), lc.meanArea(s));
            if (withRandom && s != Strategy.RANDOM) {
                out.printf(Locale.ROOT, "auc_gain_%s=%.4f%n", s.word(), lc.areaGain(s, Strategy.RANDOM));
                out.printf("auc_gain_%s_interval=%s%n", s.word(),
                        interval(lc.areaGainInterval(s, Strategy.RANDOM), "%.4f"));
                out.printf("auc_wins_%s=%d/%d%n", s.word(), lc.areaWins(s, Strategy.RANDOM), lc.seeds());
            }
        }
        java.util.TreeSet<Integer> at = new java.util.TreeSet<>();
        for (int n : FIXED_COUNTS) {
            if (n <= grid[grid.length - 1]) {
                at.add(lc.nearest(n));
            }
        }
        at.add(grid[grid.length - 1]);
        for (int n : at) {
            for (Strategy s : strategies) {
                LearningCurves.Spread a = lc.accuracyAt(s, n);
                LearningCurves.Spread l = lc.nllAt(s, n);
                out.printf(Locale.ROOT, "accuracy_at_%d_%s=%.4f (%.4f..%.4f)%n", n, s.word(), a.median(), a.q25(),
                        a.q75());
                out.printf(Locale.ROOT, "nll_at_%d_%s=%.4f (%.4f..%.4f)%n", n, s.word(), l.median(), l.q25(), l.q75());
            }
        }
        StopSummary.print(out, StopSummary.seeds(points, plan.strategies(), plan.seeds()), plan.strategies());
        out.flush();
    }

    /** A number for the CSV: empty when there is none. */
    private static String cell(double v) {
        return Double.isNaN(v) ? "" : String.format(Locale.ROOT, "%.5f", v);
    }

    private static String count(int labels) {
        return labels == LearningCurves.NEVER ? "none" : Integer.toString(labels);
    }

    private static String number(double v, String format) {
        if (Double.isNaN(v)) {
            return "none";
        }
        return Double.isInfinite(v) ? "inf" : String.format(Locale.ROOT, format, v);
    }

    /** "lo..hi" with inf for an open end, or none when no replicate defines it. */
    private static String interval(Bootstrap.Interval ci, String format) {
        if (Double.isNaN(ci.lower())) {
            return "none";
        }
        return number(ci.lower(), format) + ".." + number(ci.upper(), format);
    }

    /** 0.9 -> "0.9", 0.95 -> "0.95": the target as typed. */
    static String targetName(double t) {
        String s = String.format(Locale.ROOT, "%.4f", t);
        return s.replaceAll("0+$", "").replaceAll("\\.$", "");
    }
}
