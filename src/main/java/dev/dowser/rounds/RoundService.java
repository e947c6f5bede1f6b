package dev.dowser.rounds;

import dev.dowser.acquire.ColdStart;
import dev.dowser.acquire.PoolScorer;
import dev.dowser.acquire.SpotChecks;
import dev.dowser.data.FeatureMatrix;
import dev.dowser.json.Json;
import dev.dowser.sampler.Sample;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;
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

    /** What a round did. */
    public record Outcome(int round, boolean published, int queued, String kernel, String message) {
    }

    private final Database db;
    private final SamplerConfig config;
    private final PoolScorer scorer;
    /** Pools never change after import, so their feature matrices are loaded once. */
    private final ConcurrentHashMap<String, FeatureMatrix> matrices = new ConcurrentHashMap<>();

    public RoundService(Database db, SamplerConfig config, PoolScorer scorer) {
        this.db = db;
        this.config = config;
        this.scorer = scorer;
    }

    public Outcome run(String poolName) {
        PoolRow pool = db.pools().require(poolName);
        PoolSettings settings = PoolSettings.parse(pool.settingsJson());
        Set<Long> labelled = new HashSet<>();
        db.labels().forEachCurrent(pool.id(), l -> labelled.add(l.row()));
        int round = db.rounds().start(pool.id(), labelled.size());
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
            if (labelled.isEmpty()) {
                float[] cx = gather(m, candidates);
                int[] picks = ColdStart.kmeansPlusPlus(cx, candidates.length, m.cols(), b, rng);
                for (SpotChecks.Entry e : SpotChecks.mix(picks, candidates.length, b, settings.spotCheckShare(), rng)) {
                    entries.add(new QueueEntry(round, entries.size(), candidates[e.candidate()], 0, e.spotCheck(), null,
                            null, null));
                }
                kernel = "none";
                message = "no labels yet: the first batch is spread over the pool by k-means++";
            } else {
                Sample sample = new PoolPosterior(db, config).sampleRound(poolName, m, probe(m, candidates));
                float[] cx = gather(m, candidates);
                PoolScorer.Result scores = scorer.score(sample.layout(), sample.draws(), cx, candidates.length);
                int[] picks = BatchPicker.pick(settings.strategy(), b, scores, cx, sample.layout(), sample.draws(), rng);
                int c = scores.classes();
                for (SpotChecks.Entry e : SpotChecks.mix(picks, candidates.length, b, settings.spotCheckShare(), rng)) {
                    float[] p = Arrays.copyOfRange(scores.meanProbabilities(), e.candidate() * c, (e.candidate() + 1) * c);
                    entries.add(new QueueEntry(round, entries.size(), candidates[e.candidate()],
                            scores.bald()[e.candidate()], e.spotCheck(), Json.write(p), null, null));
                }
                kernel = sample.choice().kernel().word();
                message = sample.choice().why();
                health = Json.write(sample.health());
            }
            db.queues().publish(pool.id(), round, entries);
            db.rounds().finish(pool.id(), round, kernel, message, health);
            return new Outcome(round, true, entries.size(), kernel, message);
        } catch (RuntimeException e) {
            String why = e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
            db.rounds().fail(pool.id(), round, why);
            return new Outcome(round, false, 0, null, why);
        }
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
