package dev.dowser.stats;

/** Chance-corrected agreement between people who labelled the same records. Pure functions. */
public final class Kappa {

    private Kappa() {
    }

    /**
     * Cohen's kappa (Cohen 1960) from a square table: {@code table[a][b]} counts the records the
     * first person put in class a and the second in class b.
     * kappa = (p_o - p_e) / (1 - p_e), p_o = sum_i t_ii / n, p_e = sum_i (t_i. / n)(t_.i / n).
     * NaN when there is nothing to compare or chance agreement is already total.
     */
    public static double cohen(long[][] table) {
        int k = table.length;
        long n = 0;
        long diagonal = 0;
        double[] rows = new double[k];
        double[] cols = new double[k];
        for (int a = 0; a < k; a++) {
            if (table[a].length != k) {
                throw new IllegalArgumentException("the table must be square: row " + a + " has "
                        + table[a].length + " cells, not " + k);
            }
            for (int b = 0; b < k; b++) {
                long t = table[a][b];
                if (t < 0) {
                    throw new IllegalArgumentException("counts cannot be negative: cell [" + a + "][" + b + "] is " + t);
                }
                n += t;
                rows[a] += t;
                cols[b] += t;
                if (a == b) {
                    diagonal += t;
                }
            }
        }
        if (n == 0) {
            return Double.NaN;
        }
        double observed = (double) diagonal / n;
        double chance = 0;
        for (int i = 0; i < k; i++) {
            chance += (rows[i] / n) * (cols[i] / n);
        }
        return chance >= 1 ? Double.NaN : (observed - chance) / (1 - chance);
    }

    /** Cohen's kappa between two labellings of the same records, each a class index per record. */
    public static double cohen(int[] first, int[] second, int classes) {
        if (first.length != second.length) {
            throw new IllegalArgumentException(first.length + " labels against " + second.length);
        }
        long[][] table = new long[classes][classes];
        for (int i = 0; i < first.length; i++) {
            table[first[i]][second[i]]++;
        }
        return cohen(table);
    }

    /**
     * Fleiss' kappa (Fleiss 1971) from {@code counts[i][j]}, the number of people who put record i
     * in class j. Records with fewer than two labels carry no agreement and are left out. With m_i
     * labels on record i: P_i = sum_j n_ij (n_ij - 1) / (m_i (m_i - 1)), P = mean P_i,
     * p_j = sum_i n_ij / sum_i m_i, P_e = sum_j p_j^2, kappa = (P - P_e) / (1 - P_e). With the
     * same m for every record this is Fleiss' formula exactly; a varying m is the usual extension.
     */
    public static double fleiss(int[][] counts) {
        if (counts.length == 0) {
            return Double.NaN;
        }
        int k = counts[0].length;
        double[] classTotals = new double[k];
        double labels = 0;
        double sumP = 0;
        int records = 0;
        for (int i = 0; i < counts.length; i++) {
            if (counts[i].length != k) {
                throw new IllegalArgumentException("record " + i + " has " + counts[i].length
                        + " class counts, not " + k);
            }
            long m = 0;
            long agreeing = 0;
            for (int j = 0; j < k; j++) {
                int c = counts[i][j];
                if (c < 0) {
                    throw new IllegalArgumentException("counts cannot be negative: record " + i + ", class " + j);
                }
                m += c;
                agreeing += (long) c * (c - 1);
            }
            if (m < 2) {
                continue;
            }
            records++;
            sumP += (double) agreeing / (m * (m - 1));
            labels += m;
            for (int j = 0; j < k; j++) {
                classTotals[j] += counts[i][j];
            }
        }
        if (records == 0) {
            return Double.NaN;
        }
        double observed = sumP / records;
        double chance = 0;
        for (int j = 0; j < k; j++) {
            double p = classTotals[j] / labels;
            chance += p * p;
        }
        return chance >= 1 ? Double.NaN : (observed - chance) / (1 - chance);
    }
}
