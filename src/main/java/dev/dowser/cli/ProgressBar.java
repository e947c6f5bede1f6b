package dev.dowser.cli;

import java.io.PrintStream;

/**
 * Progress of a long command: on a terminal, one line redrawn in place; otherwise (a log, a pipe, CI)
 * a line of its own at most every {@link #LINE_INTERVAL_NANOS}, so a run in the background still
 * shows where it is. Both say how long is left at the rate so far.
 */
final class ProgressBar {

    static final int WIDTH = 30;
    static final long MIN_INTERVAL_NANOS = 100_000_000L;
    static final long LINE_INTERVAL_NANOS = 15_000_000_000L;

    private final PrintStream out;
    private final boolean terminal;
    private final String unit;
    private final long begun = System.nanoTime();
    private long lastDraw;

    ProgressBar(PrintStream out, String unit) {
        this(out, unit, System.console() != null);
    }

    ProgressBar(PrintStream out, String unit, boolean terminal) {
        this.out = out;
        this.terminal = terminal;
        this.unit = unit;
        this.lastDraw = begun;
    }

    /**
     * Shows {@code done} of {@code total} (total unknown when 0 or less); {@code items} is what is
     * counted. Several threads may call it (simulate runs curves side by side).
     */
    synchronized void show(long done, long total, long items) {
        long now = System.nanoTime();
        long interval = terminal ? MIN_INTERVAL_NANOS : LINE_INTERVAL_NANOS;
        if (now - lastDraw < interval && !(terminal && done >= total && total > 0)) {
            return;
        }
        lastDraw = now;
        StringBuilder s = new StringBuilder(terminal ? "\r" : "");
        if (total > 0) {
            double f = Math.min(1.0, (double) done / total);
            if (terminal) {
                int filled = (int) Math.round(f * WIDTH);
                s.append('[').append("=".repeat(filled)).append(" ".repeat(WIDTH - filled)).append("] ");
            }
            s.append(String.format("%3.0f%%  ", 100 * f));
        }
        s.append(String.format("%,d %s", items, unit));
        double seconds = (now - begun) / 1e9;
        if (total > 0 && done > 0 && done < total) {
            s.append(String.format(", %s so far, about %s left", duration(seconds),
                    duration(seconds * (total - done) / done)));
        }
        if (terminal) {
            out.print(s + "   ");
        } else {
            out.println(s);
        }
        out.flush();
    }

    void finish() {
        if (terminal) {
            out.println();
        }
    }

    static String duration(double seconds) {
        long s = Math.round(seconds);
        return s < 60 ? s + " s" : s < 3600 ? (s / 60) + " min " + (s % 60) + " s" : (s / 3600) + " h " + (s % 3600 / 60) + " min";
    }
}
