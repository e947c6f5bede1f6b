package dev.dowser.rounds;

import dev.dowser.acquire.ColdStart;
import dev.dowser.acquire.PoolScorer;
import dev.dowser.acquire.SpotChecks;
import dev.dowser.data.FeatureMatrix;
import dev.dowser.json.Json;
import dev.dowser.sampler.Predictive;
import dev.dowser.sampler.Sample;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.sampler.SamplingStopped;
import dev.dowser.sampler.StopSignal;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
import dev.dowser.store.PredictionStore;
import dev.dowser.store.QueueEntry;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.SplittableRandom;
import java.util.concurrent.ConcurrentHashMap;

/**
 * Runs a round for a pool: continue the chains on the labels so far (or, with no labels yet, seed
 * the first batch by k-means++), score every unlabelled record, pick a batch, mix in spot checks,
 * and publish the queue at once. A round that fails is recorded with its reason and the previous
 * queue stays in service.
 */
public final class RoundService {

    /** What a round did: its status is {@code published}, {@code failed} or {@code stopped}. */
    public record Outcome(int round, String status, int queued, String kernel, String message, double seconds) {

        public boolean published() {
            return PUBLISHED.equals(status);
        }
    }

    public static final String PUBLISHED = "published";
    public static final String FAILED = "failed";
    public static final String STOPPED = "stopped";

    private final Database db;
    private final SamplerConfig config;
    private final PoolScorer scorer;
    private final RoundEvents events;
    /** Pools never change after import, so their feature matrices are loaded once. */
    private final ConcurrentHashMap<String, FeatureMatrix> matrices = new ConcurrentHashMap<>();

    public RoundService(Database db, SamplerConfig config, PoolScorer scorer) {
        this(db, config, scorer, RoundEvents.NONE);
    }

    public RoundService(Database db, SamplerConfig config, PoolScorer scorer, RoundEvents events) {
        this.db = db;
        this.config = config;
        this.scorer = scorer;
        this.events = events;
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
        // Records anyone has labelled are not picked again, resolved or not; the model learns from final labels.
        Set<Long> labelled = new HashSet<>();
        int[] finals = {0};
        db.labels().forEachResolution(pool.id(), r -> {
            labelled.add(r.row());
            if (r.finalLabel() != null) {
                finals[0]++;
            }
        });
        int round = db.rounds().start(pool.id(), finals[0]);
        events.roundStarted(poolName, round);
        Outcome outcome = runStarted(pool, settings, labelled, finals[0] == 0, round, stop, begun);
        events.roundEnded(poolName, outcome);
        return outcome;
    }

    private Outcome runStarted(PoolRow pool, PoolSettings settings, Set<Long> labelled, boolean cold, int round,
                               StopSignal stop, long begun) {
        String poolName = pool.name();
        try {
            FeatureMatrix m = matrices.computeIfAbsent(poolName, name -> FeatureMatrix.load(db, name));
            int[] candidates = new int[m.rows() - labelled.size()];
            int at = 0;
            for (int i = 0; i < m.rows() && at < candidates.length; i++) {
                if (!labelled.contains((long) i)) {
                    candidates[at++] = i;
                }
            }
            SplittableRandom rng = new SplittableRandom(config.seed() * 31 + round);
            int b = Math.min(settings.batchSize(), candidates.length);
            List<QueueEntry> entries = new ArrayList<>();
            String kernel;
            String message;
            String health = null;
            if (cold) {
                float[] cx = gather(m, candidates);
                int[] picks = ColdStart.kmeansPlusPlus(cx, candidates.length, m.cols(), b, rng);
                for (SpotChecks.Entry e : SpotChecks.mix(picks, candidates.length, b, settings.spotCheckShare(), rng)) {
                    entries.add(new QueueEntry(round, entries.size(), candidates[e.candidate()], 0, e.spotCheck(), null,
                            null, null));
                }
                kernel = "none";
                message = "no labels yet: the first batch is spread over the pool by k-means++";
            } else {
                Sample sample = new PoolPosterior(db, config).sampleRound(poolName, m, probe(m, candidates), stop);
                float[] cx = gather(m, candidates);
                PoolScorer.Result scores = scorer.score(sample.layout(), sample.draws(), cx, candidates.length);
                int[] picks = BatchPicker.pick(settings.strategy(), b, scores, cx, sample.layout(), sample.draws(), rng);
                List<SpotChecks.Entry> mixed = SpotChecks.mix(picks, candidates.length, b, settings.spotCheckShare(), rng);
                int[] queued = mixed.stream().mapToInt(e -> candidates[e.candidate()]).toArray();
                Predictive.Belief belief = Predictive.belief(sample.layout(), sample.draws(), gather(m, queued),
                        queued.length);
                for (SpotChecks.Entry e : mixed) {
                    int i = entries.size();
                    entries.add(new QueueEntry(round, i, candidates[e.candidate()], scores.bald()[e.candidate()],
                            e.spotCheck(), beliefJson(belief, i), null, null));
                }
                kernel = sample.choice().kernel().word();
                message = sample.choice().why();
                health = Json.write(sample.health());
                keepPredictions(pool, round, m, labelled, sample);
            }
            entries = carryOver(db.queues().awaitingSecondLabel(pool.id()), round,
                    sendToTwo(entries, settings.doubleLabelShare(), rng));
            db.records().warm(pool.id(), entries.stream().mapToLong(QueueEntry::row).toArray());
            db.queues().publish(pool.id(), round, entries);
            db.rounds().finish(pool.id(), round, kernel, message, health);
            return new Outcome(round, PUBLISHED, entries.size(), kernel, message, seconds(begun));
        } catch (SamplingStopped e) {
            String why = "stopped at a safe point because the server is shutting down; the chains were saved"
                    + " and the next round continues them";
            db.rounds().stop(pool.id(), round, e.choice().kernel().word(), why);
            return new Outcome(round, STOPPED, 0, e.choice().kernel().word(), why, seconds(begun));
        } catch (RuntimeException e) {
            String why = e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
            db.rounds().fail(pool.id(), round, why);
            return new Outcome(round, FAILED, 0, null, why, seconds(begun));
        }
    }

    /**
     * Marks {@code share} of the queue, chosen uniformly, to be labelled by two different people:
     * the pairs that agreement is measured on.
     */
    static List<QueueEntry> sendToTwo(List<QueueEntry> entries, double share, SplittableRandom rng) {
        int n = entries.size();
        int twice = (int) Math.round(share * n);
        int[] order = new int[n];
        for (int i = 0; i < n; i++) {
            order[i] = i;
        }
        // The first `twice` places of a partial Fisher-Yates shuffle: a uniform subset of that size.
        boolean[] chosen = new boolean[n];
        for (int i = 0; i < twice; i++) {
            int j = i + rng.nextInt(n - i);
            int t = order[i];
            order[i] = order[j];
            order[j] = t;
            chosen[order[i]] = true;
        }
        List<QueueEntry> out = new ArrayList<>(n);
        for (int i = 0; i < n; i++) {
            out.add(chosen[i] ? entries.get(i).withCopies(2) : entries.get(i));
        }
        return out;
    }

    /**
     * The new queue: records still waiting for their second label first (they are work in
     * progress, picked by an earlier round), then this round's picks, numbered in that order.
     */
    static List<QueueEntry> carryOver(List<QueueEntry> waiting, int round, List<QueueEntry> picked) {
        List<QueueEntry> in = new ArrayList<>(waiting);
        in.addAll(picked);
        List<QueueEntry> out = new ArrayList<>(in.size());
        for (QueueEntry e : in) {
            out.add(new QueueEntry(round, out.size(), e.row(), e.score(), e.spotCheck(), e.predictionJson(), null, null,
                    e.copies()));
        }
        return out;
    }

    /** The posterior predictive of every labelled record, for the review page's model-disagrees filter. */
    private void keepPredictions(PoolRow pool, int round, FeatureMatrix m, Set<Long> labelled, Sample sample) {
        long[] rows = labelled.stream().mapToLong(Long::longValue).sorted().toArray();
        int[] at = Arrays.stream(rows).mapToInt(r -> (int) r).toArray();
        Predictive.Belief belief = Predictive.belief(sample.layout(), sample.draws(), gather(m, at), at.length);
        db.predictions().replace(pool.id(), new PredictionStore.Predictions(round, rows, belief.mean(),
                belief.classes()));
    }

    private static double seconds(long begun) {
        return (System.nanoTime() - begun) / 1e9;
    }

    /** The belief kept with a queued record: {"mean": [...], "sd": [...]} over the classes. */
    private static String beliefJson(Predictive.Belief belief, int i) {
        int c = belief.classes();
        return dev.dowser.store.Belief.of(Arrays.copyOfRange(belief.mean(), i * c, (i + 1) * c),
                Arrays.copyOfRange(belief.sd(), i * c, (i + 1) * c)).toJson();
    }

    private static float[] gather(FeatureMatrix m, int[] rows) {
        float[] out = new float[rows.length * m.cols()];
        for (int i = 0; i < rows.length; i++) {
            System.arraycopy(m.values(), rows[i] * m.cols(), out, i * m.cols(), m.cols());
        }
        return out;
    }

    /** A few unlabelled rows, the same ones each round while they stay unlabelled: the diagnostics' probe. */
    private static float[] probe(FeatureMatrix m, int[] candidates) {
        int n = Math.min(8, candidates.length);
        return gather(m, Arrays.copyOf(candidates, n));
    }
}
