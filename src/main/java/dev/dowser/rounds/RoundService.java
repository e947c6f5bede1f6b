package dev.dowser.rounds;

import dev.dowser.data.QueuedBelief;
import dev.dowser.acquire.PoolScorer;
import dev.dowser.data.FeatureMatrix;
import dev.dowser.data.LabelledSet;
import dev.dowser.json.Json;
import dev.dowser.labels.LabelRow;
import dev.dowser.model.Architecture;
import dev.dowser.sampler.PosteriorSampler;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.sampler.SamplingStopped;
import dev.dowser.sampler.State;
import dev.dowser.sampler.StopSignal;
import dev.dowser.stats.SeedTree;
import dev.dowser.stats.StabilisingPredictions;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import dev.dowser.store.PredictionStore;
import dev.dowser.store.QueueEntry;
import dev.dowser.store.RoundStatus;
import dev.dowser.store.RoundStore;
import dev.dowser.store.SavedChain;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.concurrent.ConcurrentHashMap;

/**
 * Runs a pool's rounds: loads what a round needs once (the labels as they stand, the chains the
 * last round left, the unlabelled candidates), calls the pure {@link RoundStep}, and persists
 * once (the chains, the model's view of the labelled records, the queue, the round's record). A
 * round that fails is recorded with its reason and the previous queue stays in service. Each
 * round keeps what it was computed from (its seed, the sampler's configuration, the settings,
 * the last label row it read, the chains it continued), so {@link #rebuild} can compute its
 * queue again from the database.
 */
public final class RoundService {

    /** What a round did: it was published, failed or was stopped; {@code queued} counts its batch, not its reserve. */
    public record Outcome(int round, RoundStatus status, int queued, String kernel, String message, double seconds) {

        public boolean published() {
            return status == RoundStatus.PUBLISHED;
        }
    }

    /** Records of a new queue read into the record cache as it is published: its batch, then its reserve. */
    static final int WARM_RECORDS = 1_000;

    /** The root of the server's seed tree; each pool has its own branch below it (its id). */
    public static final long DEFAULT_SEED = 1;
    /** The branch of a pool's seed node that draws its stop set, fixed for the pool's life. */
    public static final int STOP_SET = 0;

    private final Database db;
    private final SamplerConfig config;
    private final long seed;
    private final PoolScorer scorer;
    private final RoundEvents events;
    /** Pools never change after import, so their feature matrices are loaded once. */
    private final ConcurrentHashMap<String, FeatureMatrix> matrices = new ConcurrentHashMap<>();

    public RoundService(Database db, SamplerConfig config, PoolScorer scorer) {
        this(db, config, DEFAULT_SEED, scorer, RoundEvents.NONE);
    }

    public RoundService(Database db, SamplerConfig config, long seed, PoolScorer scorer, RoundEvents events) {
        this.db = db;
        this.config = config;
        this.seed = seed;
        this.scorer = scorer;
        this.events = events;
    }

    /**
     * The pool's node of the seed tree: the server's seed, then the pool's id. Round r of the pool
     * draws from its child r; rounds count from 1, so child {@link #STOP_SET} is the pool's own.
     */
    public static SeedTree seedsOf(long serverSeed, long poolId) {
        return SeedTree.of(serverSeed).child(poolId);
    }

    public Outcome run(String poolName) {
        return run(poolName, StopSignal.never());
    }

    /**
     * Runs one round. Raising {@code stop} ends the sampling at a safe point: the chains are saved,
     * the round is recorded as stopped and the served queue stays as it was.
     */
    public Outcome run(String poolName, StopSignal stop) {
        long begun = System.nanoTime();
        PoolRow pool = db.pools().require(poolName);
        PoolSettings settings = PoolSettings.parse(pool.settingsJson());
        long lastLabel = db.labels().lastLabelId(pool.id());
        Labels labels = Labels.read(db, pool, lastLabel);
        List<SavedChain> saved = db.chains().load(pool.id());
        int round = db.rounds().next(pool.id());
        SeedTree seeds = seedsOf(seed, pool.id()).child(round);
        SamplerConfig sampler = settings.sampler(config);
        RoundStore.Inputs inputs = new RoundStore.Inputs(seeds.seed(), Json.write(sampler), settings.toJson(), lastLabel,
                saved.isEmpty() ? null : saved.get(0).round());
        db.rounds().start(pool.id(), round, labels.finalRows().length, inputs);
        events.roundStarted(poolName, round);
        Outcome outcome;
        try {
            RoundStep.Input input = input(pool, settings, labels, saved, seeds, round, sampler);
            RoundStep.Result result = RoundStep.run(input, scorer, stop);
            outcome = persist(pool, input, result, begun);
        } catch (SamplingStopped e) {
            String why = "stopped at a safe point because the server is shutting down; the chains were saved"
                    + " and the next round continues them";
            Architecture arch = e.layout().architecture();
            db.chains().save(pool.id(), ChainStates.toSaved(e.lastStates(), e.choice().kernel().word(), arch, round));
            db.rounds().stop(pool.id(), round, e.choice().kernel().word(), why);
            outcome = new Outcome(round, RoundStatus.STOPPED, 0, e.choice().kernel().word(), why, seconds(begun));
        } catch (RuntimeException | OutOfMemoryError e) {
            // Out of memory in a round: its arrays are garbage once it unwinds, so the round fails with
            // a message and the server serves on, instead of the round staying "running" for ever.
            String why = e instanceof OutOfMemoryError ? "the server ran out of memory in this round (heap "
                    + (Runtime.getRuntime().maxMemory() >> 20) + " MiB); start it with a larger heap (java -Xmx...)"
                    : e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
            db.rounds().fail(pool.id(), round, why);
            outcome = new Outcome(round, RoundStatus.FAILED, 0, null, why, seconds(begun));
        }
        events.roundEnded(poolName, outcome);
        return outcome;
    }

    /**
     * Computes round {@code round} of the pool again from what it kept: its labels, the chains it
     * continued, its settings, sampler and seed. The queue comes out as the round published it
     * (before records awaiting a second label were carried over ahead of it).
     */
    public RoundStep.Result rebuild(String poolName, int round) {
        PoolRow pool = db.pools().require(poolName);
        RoundStore.Inputs kept = db.rounds().inputs(pool.id(), round).orElseThrow(() -> new IllegalArgumentException(
                "round " + round + " of pool '" + poolName + "' did not keep what it was computed from"));
        List<SavedChain> saved = kept.chainsFrom() == null ? List.of() : db.chains().load(pool.id(), kept.chainsFrom());
        if (kept.chainsFrom() != null && saved.isEmpty()) {
            throw new IllegalArgumentException("the chains round " + round + " continued (from round "
                    + kept.chainsFrom() + ") are no longer kept; only the latest rounds can be rebuilt");
        }
        Labels labels = Labels.read(db, pool, kept.lastLabelId());
        SamplerConfig sampler = Json.read(kept.samplerJson(), SamplerConfig.class);
        RoundStep.Input input = input(pool, PoolSettings.parse(kept.settingsJson()), labels, saved,
                new SeedTree(kept.seed()), round, sampler);
        return RoundStep.run(input, scorer, StopSignal.never());
    }

    /** The round step's input from what was loaded. */
    private RoundStep.Input input(PoolRow pool, PoolSettings settings, Labels labels, List<SavedChain> saved,
                                  SeedTree seeds, int round, SamplerConfig sampler) {
        FeatureMatrix m = matrices.computeIfAbsent(pool.name(), name -> FeatureMatrix.load(db, name));
        int classes = pool.classes().size();
        Architecture arch = new PosteriorSampler(sampler).layout(m.cols(), classes).architecture();
        List<State<?>> chains = ChainStates.continuable(saved, arch, sampler.chains().count());
        int[] candidates = labels.unlabelled(m.rows());
        int[] judged = labels.judgedRows();
        LabelledSet known = LabelledSet.of(m, labels.finalRows(), labels.finalClasses(), pool.classes());
        return new RoundStep.Input(known, rows(m, candidates), rows(m, judged), chains, stopSet(pool, m), settings,
                sampler, seeds, round);
    }

    /**
     * The pool's stop set (Bloodgood & Vijay-Shanker 2009): a fixed uniform sample of its records,
     * with the class the latest round predicted for each (-1 where it predicted none).
     */
    private Settling.StopSet stopSet(PoolRow pool, FeatureMatrix m) {
        long[] rows = StabilisingPredictions.stopSet(m.rows(), StabilisingPredictions.STOP_SET_RECORDS,
                seedsOf(seed, pool.id()).child(STOP_SET).rng());
        RoundStep.Rows stop = rows(m, Arrays.stream(rows).mapToInt(r -> (int) r).toArray());
        int[] previous = new int[rows.length];
        Arrays.fill(previous, -1);
        db.predictions().latestStopSet(pool.id()).ifPresent(p -> {
            for (int i = 0; i < rows.length; i++) {
                int at = Arrays.binarySearch(p.rows(), rows[i]);
                previous[i] = at >= 0 ? p.classes()[at] : -1;
            }
        });
        return new Settling.StopSet(stop, previous);
    }

    private static RoundStep.Rows rows(FeatureMatrix m, int[] which) {
        return new RoundStep.Rows(m.rows(which), Arrays.stream(which).asLongStream().toArray(), m.cols());
    }

    private Outcome persist(PoolRow pool, RoundStep.Input input, RoundStep.Result result, long begun) {
        int round = result.round();
        String health = null;
        if (!result.cold()) {
            var draws = result.draws();
            db.chains().save(pool.id(), ChainStates.toSaved(draws.lastStates(), result.kernel(),
                    draws.layout().architecture(), round));
            db.predictions().replace(pool.id(), new PredictionStore.Predictions(round, input.judged().rows(),
                    result.judgedMean(), pool.classes().size()));
            health = Json.write(draws.health());
            Settling settling = result.settling();
            db.predictions().replaceStopSet(pool.id(), new PredictionStore.StopSetClasses(round, settling.stopRows(),
                    settling.stopClasses()));
            db.rounds().settled(pool.id(), round, new RoundStore.Settled(settling.candidates(),
                    settling.agreement(), settling.compared(), settling.information(), settling.informationTop()));
        }
        // Read ahead what the desk will show first: the batch and the start of the reserve.
        db.records().warm(pool.id(), java.util.stream.Stream.concat(result.queue().stream(), result.reserve().stream())
                .limit(WARM_RECORDS).mapToLong(RoundStep.Pick::row).toArray());
        List<QueueEntry> entries = db.queues().publish(pool.id(), round, entries(round, result.queue()),
                entries(round, result.reserve()));
        db.rounds().finish(pool.id(), round, result.kernel(), result.why(), health);
        int queued = (int) entries.stream().filter(e -> !e.reserve()).count();
        return new Outcome(round, RoundStatus.PUBLISHED, queued, result.kernel(), result.why(), seconds(begun));
    }

    /** Queue places from a round's picks, numbered in order; the reserve, ranked rather than picked, has no pick probability. */
    private static List<QueueEntry> entries(int round, List<RoundStep.Pick> picks) {
        List<QueueEntry> out = new ArrayList<>(picks.size());
        for (RoundStep.Pick p : picks) {
            String belief = p.mean() == null ? null : QueuedBelief.write(p.mean(), p.sd());
            out.add(new QueueEntry(round, out.size(), p.row(), p.score(), p.spotCheck(), belief, null, null,
                    p.copies(), Double.isNaN(p.probability()) ? null : p.probability(),
                    p.order() == 0 ? null : p.order(), false));
        }
        return out;
    }

    private static double seconds(long begun) {
        return (System.nanoTime() - begun) / 1e9;
    }

    /**
     * The pool's labels as a round reads them, in one pass over the label rows up to a given one:
     * the records anyone labelled (never picked again, resolved or not) and those with a final
     * label in the label set (what the model learns from), each in pool order.
     */
    record Labels(int[] judgedRows, int[] finalRows, int[] finalClasses) {

        static Labels read(Database db, PoolRow pool, long lastLabelId) {
            List<Integer> judged = new ArrayList<>();
            List<int[]> finals = new ArrayList<>();
            db.labels().forEachResolutionUpTo(pool.id(), lastLabelId, r -> {
                judged.add((int) r.row());
                LabelRow f = r.finalLabel();
                int k = f == null ? -1 : pool.classes().indexOf(f.label());
                if (k >= 0) {
                    finals.add(new int[] {(int) r.row(), k});
                }
            });
            return new Labels(judged.stream().mapToInt(Integer::intValue).toArray(),
                    finals.stream().mapToInt(f -> f[0]).toArray(), finals.stream().mapToInt(f -> f[1]).toArray());
        }

        /** Rows 0..n-1 that nobody has labelled, in order. */
        int[] unlabelled(int n) {
            boolean[] taken = new boolean[n];
            for (int r : judgedRows) {
                taken[r] = true;
            }
            int[] out = new int[n - judgedRows.length];
            int at = 0;
            for (int i = 0; i < n; i++) {
                if (!taken[i]) {
                    out[at++] = i;
                }
            }
            return out;
        }
    }
}
