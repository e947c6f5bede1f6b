package dev.dowser.data;

import com.fasterxml.jackson.core.io.NumberInput;
import java.util.Locale;

/** Recognises and parses the plain decimal numbers of a data file, strictly and fast. */
final class NumberText {

    /** Exact powers of ten as doubles: 10^0 to 10^22, the largest exactly representable. */
    private static final double[] POW10 = new double[23];
    private static final long MAX_EXACT = 1L << 53;

    static {
        double p = 1;
        for (int i = 0; i < POW10.length; i++) {
            POW10[i] = p;
            p *= 10;
        }
    }

    private NumberText() {
    }

    /** A plain decimal such as {@code -12}, {@code 3.5}, {@code .5} or {@code 6.02e23}, spaces around allowed. */
    static boolean looksNumeric(String s) {
        return !Double.isNaN(parse(s));
    }

    /** Words that spell a non-finite number in common data tools. */
    static boolean looksNonFinite(String s) {
        String t = s.strip().toLowerCase(Locale.ROOT);
        if (t.startsWith("+") || t.startsWith("-")) {
            t = t.substring(1);
        }
        return t.equals("nan") || t.equals("inf") || t.equals("infinity");
    }

    static double parse(String s) {
        char[] a = s.toCharArray();
        return parse(a, 0, a.length);
    }

    /**
     * Parses {@code a[from, to)} as a plain decimal in one pass, or returns NaN when it is not one
     * (the caller says why). When the digits fit in 53 bits and the power of ten is at most 22,
     * m * 10^e and m / 10^e are correctly rounded (Clinger 1990, the fast path); otherwise the
     * full parser decides. Numbers beyond the double range come back infinite.
     */
    static double parse(char[] a, int from, int to) {
        int i = from;
        int n = to;
        while (i < n && a[i] == ' ') {
            i++;
        }
        while (n > i && a[n - 1] == ' ') {
            n--;
        }
        int start = i;
        boolean negative = false;
        if (i < n && (a[i] == '-' || a[i] == '+')) {
            negative = a[i] == '-';
            i++;
        }
        long mantissa = 0;
        int digits = 0;
        int scale = 0;
        boolean exact = true;
        char c;
        while (i < n && (c = a[i]) >= '0' && c <= '9') {
            if (mantissa < MAX_EXACT) {
                mantissa = mantissa * 10 + (c - '0');
            } else {
                exact = false;
            }
            digits++;
            i++;
        }
        if (i < n && a[i] == '.') {
            i++;
            while (i < n && (c = a[i]) >= '0' && c <= '9') {
                if (mantissa < MAX_EXACT) {
                    mantissa = mantissa * 10 + (c - '0');
                    scale--;
                } else {
                    exact = false;
                }
                digits++;
                i++;
            }
        }
        if (digits == 0) {
            return Double.NaN;
        }
        int exponent = 0;
        if (i < n && (a[i] == 'e' || a[i] == 'E')) {
            i++;
            boolean negExp = false;
            if (i < n && (a[i] == '-' || a[i] == '+')) {
                negExp = a[i] == '-';
                i++;
            }
            int expDigits = 0;
            while (i < n && (c = a[i]) >= '0' && c <= '9') {
                if (exponent < 100_000) {
                    exponent = exponent * 10 + (c - '0');
                }
                expDigits++;
                i++;
            }
            if (expDigits == 0) {
                return Double.NaN;
            }
            exponent = negExp ? -exponent : exponent;
        }
        if (i != n) {
            return Double.NaN;
        }
        int e = scale + exponent;
        if (exact && mantissa <= MAX_EXACT && e >= -22 && e <= 22) {
            double v = e >= 0 ? mantissa * POW10[e] : mantissa / POW10[-e];
            return negative ? -v : v;
        }
        return NumberInput.parseDouble(new String(a, start, n - start), true);
    }
}
