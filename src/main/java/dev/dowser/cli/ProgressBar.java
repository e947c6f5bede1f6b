package dev.dowser.cli;

import java.io.PrintStream;

/** A one-line progress bar on a terminal; silent when output is not a terminal. */
final class ProgressBar {

    static final int WIDTH = 30;
    static final long MIN_INTERVAL_NANOS = 100_000_000L;

    private final PrintStream out;
    private final boolean enabled;
    private final String unit;
    private long lastDraw;

    ProgressBar(PrintStream out, String unit) {
        this.out = out;
        this.enabled = System.console() != null;
        this.unit = unit;
    }

    /** Draws {@code done} of {@code total} (total unknown when 0 or less). */
    void show(long done, long total, long items) {
        if (!enabled) {
            return;
        }
        long now = System.nanoTime();
        if (now - lastDraw < MIN_INTERVAL_NANOS && done < total) {
            return;
        }
        lastDraw = now;
        StringBuilder s = new StringBuilder("\r");
        if (total > 0) {
            double f = Math.min(1.0, (double) done / total);
            int filled = (int) Math.round(f * WIDTH);
            s.append('[').append("=".repeat(filled)).append(" ".repeat(WIDTH - filled)).append("] ")
                    .append(String.format("%3.0f%%  ", 100 * f));
        }
        s.append(String.format("%,d %s", items, unit));
        out.print(s);
        out.flush();
    }

    void finish() {
        if (enabled) {
            out.println();
        }
    }
}
