package dev.dowser.web;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import java.util.SplittableRandom;
import java.util.function.Function;

/**
 * A generator of fuzz inputs: one value from one random stream. Everything an input is made of is
 * drawn from the stream it is given, so an input is fully given by the seed of that stream and can
 * be made again from it ({@link Tries}). Our own small set of combinators for {@link FuzzInputs}.
 */
@FunctionalInterface
interface Gen<T> {

    T next(SplittableRandom random);

    default <U> Gen<U> map(Function<? super T, ? extends U> f) {
        return r -> f.apply(next(r));
    }

    default <U> Gen<U> flatMap(Function<? super T, Gen<U>> f) {
        return r -> f.apply(next(r)).next(r);
    }

    /** Lists of {@code min} to {@code max} values (both inclusive). */
    default Gen<List<T>> list(int min, int max) {
        return r -> {
            int n = min + r.nextInt(max - min + 1);
            List<T> out = new ArrayList<>(n);
            for (int i = 0; i < n; i++) {
                out.add(next(r));
            }
            return out;
        };
    }

    default Gen<List<T>> list(int size) {
        return list(size, size);
    }

    /** Lists of {@code min} to {@code max} distinct values; shorter when the values run out. */
    default Gen<List<T>> uniqueList(int min, int max) {
        return r -> {
            int n = min + r.nextInt(max - min + 1);
            Set<T> out = new LinkedHashSet<>();
            for (int tries = 0; out.size() < n && tries < 20 * n; tries++) {
                out.add(next(r));
            }
            return List.copyOf(out);
        };
    }

    static <T> Gen<T> constant(T value) {
        return r -> value;
    }

    @SafeVarargs
    static <T> Gen<T> of(T... values) {
        return of(Arrays.asList(values));
    }

    static <T> Gen<T> of(List<T> values) {
        List<T> copy = List.copyOf(values);
        return r -> copy.get(r.nextInt(copy.size()));
    }

    /** Integers from {@code lo} to {@code hi}, both inclusive. */
    static Gen<Integer> ints(int lo, int hi) {
        return r -> lo + (int) r.nextLong((long) hi - lo + 1);
    }

    static Gen<Integer> anyInt() {
        return SplittableRandom::nextInt;
    }

    static Gen<Long> anyLong() {
        return SplittableRandom::nextLong;
    }

    /** Uniform doubles in [lo, hi), rounded to {@code scale} decimals when {@code scale >= 0}. */
    static Gen<Double> doubles(double lo, double hi, int scale) {
        return r -> {
            double d = r.nextDouble(lo, hi);
            return scale < 0 ? d : java.math.BigDecimal.valueOf(d).setScale(scale, java.math.RoundingMode.HALF_EVEN)
                    .doubleValue();
        };
    }

    static Gen<byte[]> bytes(int maxLength) {
        return r -> {
            byte[] b = new byte[r.nextInt(maxLength + 1)];
            r.nextBytes(b);
            return b;
        };
    }

    /** A weighted choice of generators: {@code w(6, a), w(1, b)} draws from a six times in seven. */
    @SafeVarargs
    static <T> Gen<T> frequency(Weighted<T>... choices) {
        int total = Arrays.stream(choices).mapToInt(Weighted::weight).sum();
        return r -> {
            int pick = r.nextInt(total);
            for (Weighted<T> c : choices) {
                pick -= c.weight();
                if (pick < 0) {
                    return c.gen().next(r);
                }
            }
            throw new AssertionError("weights sum to " + total);
        };
    }

    static <T> Weighted<T> w(int weight, Gen<T> gen) {
        return new Weighted<>(weight, gen);
    }

    /** A subset of {@code values} in their order, each kept with probability one half. */
    static <T> Gen<List<T>> subsetOf(List<T> values) {
        return r -> values.stream().filter(v -> r.nextBoolean()).toList();
    }

    record Weighted<T>(int weight, Gen<T> gen) {
        public Weighted {
            if (weight <= 0) {
                throw new IllegalArgumentException("a weight must be positive, not " + weight);
            }
        }
    }
}
