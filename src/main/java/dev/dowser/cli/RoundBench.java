package dev.dowser.cli;

import dev.dowser.acquire.PoolScorer;
import dev.dowser.blas.RowMajor;
import dev.dowser.data.LabelledSet;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.RoundStep;
import dev.dowser.rounds.Settling;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.sampler.StopSignal;
import dev.dowser.stats.SeedTree;
import dev.dowser.stats.StabilisingPredictions;
import java.io.PrintWriter;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import java.util.stream.IntStream;

/**
 * A whole round, timed as the app runs it: the round step at a new pool's defaults (the default
 * strategy, temperature, kernel rule, chains and draws) on 1000 labels with the chains of the round
 * before (a warm start), scoring the other 99,000 records of a 100,000-row pool of 64 features and
 * picking a batch with its spot checks.
 */
final class RoundBench {

    static final int POOL = 100_000;
    static final int LABELLED = 1_000;
    static final int INPUTS = 64;
    static final int CLASSES = 10;

    private RoundBench() {
    }

    /**
     * The CPU time of this whole process: beside the wall time, it tells what a round costs when
     * other programs share the cores (wall time then mostly measures the wait).
     */
    static long processCpuNanos() {
        return ((com.sun.management.OperatingSystemMXBean) java.lang.management.ManagementFactory
                .getOperatingSystemMXBean()).getProcessCpuTime();
    }

    static void run(PrintWriter out, boolean quick) {
        int pool = quick ? POOL / 5 : POOL;
        SplittableRandom rng = new SplittableRandom(4);
        float[] x = new float[pool * INPUTS];
        int[] y = new int[LABELLED];
        for (int i = 0; i < pool; i++) {
            int k = rng.nextInt(CLASSES);
            if (i < LABELLED) {
                y[i] = k;
            }
            for (int j = 0; j < INPUTS; j++) {
                x[i * INPUTS + j] = (float) (rng.nextGaussian() + (j % CLASSES == k ? 1 : 0));
            }
        }
        List<String> classes = IntStream.range(0, CLASSES).mapToObj(Integer::toString).toList();
        LabelledSet labelled = new LabelledSet(Arrays.copyOf(x, LABELLED * INPUTS), y,
                IntStream.range(0, LABELLED).asLongStream().toArray(), INPUTS, classes);
        int[] unlabelled = IntStream.range(LABELLED, pool).toArray();
        RoundStep.Rows candidates = new RoundStep.Rows(RowMajor.gather(x, INPUTS, unlabelled),
                Arrays.stream(unlabelled).asLongStream().toArray(), INPUTS);
        RoundStep.Rows none = new RoundStep.Rows(new float[0], new long[0], INPUTS);
        long[] stop = StabilisingPredictions.stopSet(pool, StabilisingPredictions.STOP_SET_RECORDS, rng);
        Settling.StopSet stopSet = Settling.StopSet.fresh(new RoundStep.Rows(RowMajor.gather(x, INPUTS,
                Arrays.stream(stop).mapToInt(r -> (int) r).toArray()), stop, INPUTS));
        PoolSettings settings = PoolSettings.defaults();
        SamplerConfig sampler = settings.sampler(SamplerConfig.defaults());
        SeedTree seeds = SeedTree.of(0);
        try (PoolScorer scorer = PoolScorer.withAllCores()) {
            // The round before: a full burn-in on the same labels, whose chains the timed round continues.
            RoundStep.Result before = RoundStep.run(new RoundStep.Input(labelled, candidates, none, null, stopSet,
                    settings, sampler, seeds.child(1), 1), scorer, StopSignal.never());
            long cpu0 = processCpuNanos();
            long t0 = System.nanoTime();
            RoundStep.Result round = RoundStep.run(new RoundStep.Input(labelled, candidates, none,
                    before.draws().lastStates(), stopSet.after(before.settling()), settings, sampler, seeds.child(2), 2),
                    scorer, StopSignal.never());
            long t1 = System.nanoTime();
            long cpu1 = processCpuNanos();
            out.printf("round_pool_rows=%d%nround_labelled=%d%nround_strategy=%s%nround_temperature=%s%n"
                            + "round_kernel=%s%nround_draws=%d%nround_seconds=%.3f%nround_cpu_seconds=%.3f%n",
                    pool, LABELLED, settings.strategy().word(), sampler.temperature(), round.kernel(),
                    round.draws().draws().size(), (t1 - t0) / 1e9,
                    (cpu1 - cpu0) / 1e9);
            out.flush();
            if (round.queue().size() != settings.batchSize()) {
                throw new IllegalStateException("the round queued " + round.queue().size() + " records");
            }
        }
    }
}
