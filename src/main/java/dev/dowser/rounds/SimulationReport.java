package dev.dowser.rounds;

import dev.dowser.stats.AccuracyEstimate;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.Writer;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;

/** Writes a simulation's curves (CSV, SVG, PNG) and its summary lines. */
public final class SimulationReport {

    public static final String CSV = "curves.csv";
    public static final String SVG = "curves.svg";
    public static final String PNG = "curves.png";

    private SimulationReport() {
    }

    public static void write(Path dir, List<Simulation.Point> points, Simulation.Plan plan) throws IOException {
        Files.createDirectories(dir);
        try (Writer w = Files.newBufferedWriter(dir.resolve(CSV))) {
            w.write("strategy,seed,labels,accuracy,nll,ece,seconds,agreement,settled,estimate,estimate_lower,"
                    + "estimate_upper\n");
            for (Simulation.Point p : points) {
                AccuracyEstimate e = p.estimate() != null && p.estimate().known() ? p.estimate() : null;
                w.write(String.format(Locale.ROOT, "%s,%d,%d,%.5f,%.5f,%.5f,%.3f,%s,%b,%s,%s,%s%n", p.strategy().word(),
                        p.seed(), p.labels(), p.accuracy(), p.nll(), p.ece(), p.seconds(), cell(p.agreement()),
                        p.settled(), e == null ? "" : cell(e.accuracy()), e == null ? "" : cell(e.lower()),
                        e == null ? "" : cell(e.upper())));
            }
        }
        List<CurvePlot.Curve> curves = CurvePlot.curves(points, plan.strategies());
        CurvePlot.writeSvg(dir.resolve(SVG), curves, plan.budget());
        CurvePlot.writePng(dir.resolve(PNG), curves, plan.budget());
    }

    /**
     * A table of median test accuracy by labels for each strategy, then one line per target and
     * strategy: {@code labels_to_<target>_<strategy>=N} or {@code =none}.
     */
    public static void summary(PrintWriter out, List<Simulation.Point> points, Simulation.Plan plan,
                               List<Double> targets) {
        List<CurvePlot.Curve> curves = CurvePlot.curves(points, plan.strategies());
        StringBuilder head = new StringBuilder(String.format("%-8s", "labels"));
        curves.forEach(c -> head.append(String.format(" %10s", c.strategy().word())));
        out.println(head);
        for (int i = 0; i < curves.get(0).median().size(); i++) {
            StringBuilder row = new StringBuilder(String.format("%-8.0f", curves.get(0).median().get(i)[0]));
            for (CurvePlot.Curve c : curves) {
                row.append(i < c.median().size() ? String.format(Locale.ROOT, " %10.3f", c.median().get(i)[1])
                        : String.format(" %10s", "-"));
            }
            out.println(row);
        }
        for (double target : targets) {
            for (Strategy s : plan.strategies()) {
                int n = Simulation.labelsToReach(points, s, plan.seeds(), target);
                out.printf(Locale.ROOT, "labels_to_%s_%s=%s%n", targetName(target), s.word(), n < 0 ? "none" : n);
            }
        }
        StopSummary.print(out, StopSummary.seeds(points, plan.strategies(), plan.seeds()), plan.strategies());
        out.flush();
    }

    /** A number for the CSV: empty when there is none. */
    private static String cell(double v) {
        return Double.isNaN(v) ? "" : String.format(Locale.ROOT, "%.5f", v);
    }

    /** 0.9 -> "0.9", 0.95 -> "0.95": the target as typed. */
    static String targetName(double t) {
        String s = String.format(Locale.ROOT, "%.4f", t);
        return s.replaceAll("0+$", "").replaceAll("\\.$", "");
    }
}
