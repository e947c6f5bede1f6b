package dev.dowser.demo;

import java.io.IOException;
import java.io.Writer;
import java.time.LocalDateTime;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;

/**
 * The invented demo scenario: vibration traces from the pumps of Kettlewater Works, an imaginary
 * water works with four pumping stations. Each record is a short acceleration trace a person can
 * judge by eye, with the pump's speed and flow; each trace carries one of five conditions. Every
 * name and number here is made up, and the same seed always gives the same records.
 */
public final class PumpTraces {

    public static final List<String> CONDITIONS =
            List.of("healthy", "imbalance", "misalignment", "bearing-wear", "cavitation");
    public static final List<String> STATIONS = List.of("Upper Fen", "Millrace", "Hollow Brook", "Tarn Gate");
    public static final int TRACE_SAMPLES = 64;
    /** Samples per second of the invented accelerometers. */
    static final double SAMPLE_HZ = 400;
    static final double[] CONDITION_SHARE = {0.55, 0.12, 0.12, 0.11, 0.10};
    static final double MISSING_FLOW_SHARE = 0.02;
    static final int UNITS_PER_STATION = 6;
    static final LocalDateTime FIRST_READING = LocalDateTime.of(2026, 3, 2, 6, 0);

    /** The columns of the file {@link #write} produces. */
    public static final List<String> COLUMNS =
            List.of("reading", "unit", "station", "recorded_at", "rpm", "flow_lps", "vibration_g", "condition");
    public static final List<String> FEATURES = List.of("station", "rpm", "flow_lps", "vibration_g");
    public static final List<String> DISPLAY = List.of("unit", "station", "recorded_at", "rpm", "flow_lps", "vibration_g");

    private PumpTraces() {
    }

    /** Writes {@code records} readings as CSV with a header; the {@code condition} column is the truth. */
    public static void write(Writer out, int records, long seed) throws IOException {
        SplittableRandom rng = new SplittableRandom(seed);
        out.write(String.join(",", COLUMNS));
        out.write("\r\n");
        StringBuilder line = new StringBuilder(1024);
        for (int i = 0; i < records; i++) {
            line.setLength(0);
            int condition = pick(rng, CONDITION_SHARE);
            int station = rng.nextInt(STATIONS.size());
            int unit = 1 + station * UNITS_PER_STATION + rng.nextInt(UNITS_PER_STATION);
            double rpm = 1480 + 15 * rng.nextGaussian();
            double flow = (condition == 4 ? 30 : 42) + (condition == 4 ? 4 : 3) * rng.nextGaussian();
            LocalDateTime at = FIRST_READING.plusMinutes(17L * i + rng.nextInt(10));
            line.append(String.format(Locale.ROOT, "KW-%06d,P-%02d,%s,%s,%.1f,", i + 1, unit, STATIONS.get(station),
                    at, rpm));
            if (rng.nextDouble() >= MISSING_FLOW_SHARE) {
                line.append(String.format(Locale.ROOT, "%.2f", flow));
            }
            line.append(",\"[");
            double[] trace = trace(condition, rpm / 60.0, rng);
            for (int t = 0; t < trace.length; t++) {
                if (t > 0) {
                    line.append(',');
                }
                line.append(String.format(Locale.ROOT, "%.3f", trace[t]));
            }
            line.append("]\",").append(CONDITIONS.get(condition)).append("\r\n");
            out.write(line.toString());
        }
    }

    /** One trace: the running-speed tone, its second harmonic, and what each condition adds. */
    static double[] trace(int condition, double runHz, SplittableRandom rng) {
        double a1 = 1.0 + 0.15 * rng.nextGaussian();
        double a2 = 0.2 + 0.05 * rng.nextGaussian();
        double noise = 0.15;
        double phase1 = 2 * Math.PI * rng.nextDouble();
        double phase2 = 2 * Math.PI * rng.nextDouble();
        switch (condition) {
            case 1 -> a1 = 2.5 + rng.nextDouble();
            case 2 -> {
                a1 = 1.2 + 0.2 * rng.nextGaussian();
                a2 = 1.5 + 0.7 * rng.nextDouble();
            }
            case 4 -> noise = 0.7 + 0.2 * rng.nextDouble();
            default -> { }
        }
        double[] x = new double[TRACE_SAMPLES];
        for (int t = 0; t < TRACE_SAMPLES; t++) {
            double s = t / SAMPLE_HZ;
            x[t] = a1 * Math.sin(2 * Math.PI * runHz * s + phase1) + a2 * Math.sin(4 * Math.PI * runHz * s + phase2)
                    + noise * rng.nextGaussian();
        }
        if (condition == 3) {
            // A worn bearing rings at each defect strike: short, decaying, high-pitched bursts.
            double strikeHz = 3.6 * runHz;
            double height = 1.2 + 0.4 * rng.nextDouble();
            for (double strike = rng.nextDouble() / strikeHz; strike * SAMPLE_HZ < TRACE_SAMPLES; strike += 1 / strikeHz) {
                int at = (int) (strike * SAMPLE_HZ);
                for (int k = 0; k < 4 && at + k < TRACE_SAMPLES; k++) {
                    x[at + k] += height * Math.exp(-k) * (k % 2 == 0 ? 1 : -1);
                }
            }
        }
        if (condition == 4) {
            // Collapsing vapour bubbles: a few sharp spikes on broadband noise.
            for (int k = 0; k < 3; k++) {
                x[rng.nextInt(TRACE_SAMPLES)] += (rng.nextBoolean() ? 1 : -1) * (1.5 + rng.nextDouble());
            }
        }
        return x;
    }

    private static int pick(SplittableRandom rng, double[] shares) {
        double u = rng.nextDouble();
        double sum = 0;
        for (int i = 0; i < shares.length; i++) {
            sum += shares[i];
            if (u < sum) {
                return i;
            }
        }
        return shares.length - 1;
    }
}
