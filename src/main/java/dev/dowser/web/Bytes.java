package dev.dowser.web;

import java.util.Locale;

/** Sizes as people read them in messages: whole KiB, MiB or GiB when exact, else one decimal. */
final class Bytes {

    private Bytes() {
    }

    static String text(long bytes) {
        String[] units = {"KiB", "MiB", "GiB", "TiB"};
        if (bytes < 1024) {
            return bytes + " bytes";
        }
        double v = bytes;
        int u = -1;
        while (v >= 1024 && u < units.length - 1) {
            v /= 1024;
            u++;
        }
        return v == Math.rint(v) ? String.format(Locale.ROOT, "%.0f %s", v, units[u])
                : String.format(Locale.ROOT, "%.1f %s", v, units[u]);
    }
}
