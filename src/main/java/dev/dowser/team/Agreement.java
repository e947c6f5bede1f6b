package dev.dowser.team;

import dev.dowser.labels.Resolution;
import dev.dowser.stats.Kappa;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

/**
 * How well the team agrees, from the records more than one person labelled: Cohen's kappa for each
 * pair of people who shared records, Fleiss' kappa across the team, and a class-by-class table of
 * the labels given to the same record by two people.
 *
 * @param records   records labelled by two or more people
 * @param fleiss    Fleiss' kappa over those records (NaN when there are none)
 * @param pairs     each pair of people with the records they shared and their Cohen's kappa
 * @param classes   the class order of {@code confusion}
 * @param confusion cell [a][b] counts pairs of labels of one record where one person said a and the
 *                  other b; a pair that differs is counted in both [a][b] and [b][a], so the table
 *                  reads the same from either person's side
 */
public record Agreement(int records, double fleiss, List<Pair> pairs, List<String> classes, long[][] confusion) {

    /** Two people and what they share. */
    public record Pair(String first, String second, int records, double kappa) {
    }

    /** Agreement over {@code resolutions}; labels outside {@code classes} are left out. */
    public static Agreement of(List<Resolution> resolutions, List<String> classes) {
        int k = classes.size();
        Map<String, Integer> index = new TreeMap<>();
        for (int i = 0; i < k; i++) {
            index.put(classes.get(i), i);
        }
        List<int[]> counts = new ArrayList<>();
        Map<String, long[][]> tables = new TreeMap<>();
        long[][] confusion = new long[k][k];
        for (Resolution r : resolutions) {
            List<Resolution.Opinion> ops = r.opinions().stream().filter(o -> index.containsKey(o.label())).toList();
            if (ops.size() < 2) {
                continue;
            }
            int[] c = new int[k];
            for (Resolution.Opinion o : ops) {
                c[index.get(o.label())]++;
            }
            counts.add(c);
            for (int i = 0; i < ops.size(); i++) {
                for (int j = i + 1; j < ops.size(); j++) {
                    Resolution.Opinion a = ops.get(i);
                    Resolution.Opinion b = ops.get(j);
                    if (a.person().compareTo(b.person()) > 0) {
                        Resolution.Opinion t = a;
                        a = b;
                        b = t;
                    }
                    int ca = index.get(a.label());
                    int cb = index.get(b.label());
                    tables.computeIfAbsent(a.person() + "\n" + b.person(), key -> new long[k][k])[ca][cb]++;
                    confusion[ca][cb]++;
                    if (ca != cb) {
                        confusion[cb][ca]++;
                    }
                }
            }
        }
        List<Pair> pairs = new ArrayList<>();
        for (Map.Entry<String, long[][]> e : tables.entrySet()) {
            String[] people = e.getKey().split("\n", 2);
            long n = 0;
            for (long[] row : e.getValue()) {
                for (long v : row) {
                    n += v;
                }
            }
            pairs.add(new Pair(people[0], people[1], (int) n, Kappa.cohen(e.getValue())));
        }
        return new Agreement(counts.size(), Kappa.fleiss(counts.toArray(new int[0][])), pairs, List.copyOf(classes),
                confusion);
    }
}
