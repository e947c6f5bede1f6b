package dev.dowser.desk;

import dev.dowser.advice.ChainAdvice;
import dev.dowser.rounds.AdviceService;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.RoundWorkers;
import dev.dowser.store.Database;
import dev.dowser.store.HistoryStore;
import dev.dowser.store.PoolRow;
import dev.dowser.store.RoundStore;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;

/**
 * A pool's overview apart from the desk's own calls: its rounds page by page with their chain
 * health in plain words, the settings in force and every change to them, its records page by page
 * (for reviewers), and the two things the overview changes: a round asked for now, new settings.
 * Each call reads the pool once.
 */
public final class Overview {

    /** Most rounds in one page; older ones come on the next. */
    public static final int MAX_ROUNDS_PAGE = 200;

    /** One round as the overview lists it; {@code chains} is null while the round has no chain health. */
    public record RoundLine(RoundStore.RoundRow round, ChainAdvice chains) {
    }

    /** A page of rounds, newest first, with how many there are and the desk's progress line. */
    public record RoundsPage(int total, int offset, int limit, List<RoundLine> rounds, Progress progress) {

        public RoundsPage {
            rounds = List.copyOf(rounds);
        }
    }

    /** A pool's settings and the sampling in force (its own, else the server's). */
    public record Settings(PoolSettings settings, PoolSettings.Sampling sampling) {
    }

    /** One change of the settings: who, when, before (null for the first) and after. */
    public record SettingsChange(String by, Instant at, Settings before, Settings after) {
    }

    /** A page of records in pool order, with the pool's size. */
    public record RecordsPage(long total, long offset, int limit, List<RecordView> records) {

        public RecordsPage {
            records = List.copyOf(records);
        }
    }

    private final Database db;
    private final RoundWorkers rounds;

    public Overview(Database db, RoundWorkers rounds) {
        this.db = db;
        this.rounds = rounds;
    }

    /** The rounds, newest first, {@code limit} (1 to {@link #MAX_ROUNDS_PAGE}) from {@code offset}. */
    public RoundsPage rounds(String poolName, int offset, int limit) {
        if (offset < 0 || limit < 1 || limit > MAX_ROUNDS_PAGE) {
            throw new IllegalArgumentException("offset must be 0 or more and limit 1 to " + MAX_ROUNDS_PAGE
                    + ", got offset " + offset + " and limit " + limit);
        }
        PoolRow pool = db.pools().require(poolName);
        PoolSettings.Sampling now = inForce(pool).sampling();
        List<RoundStore.RoundRow> all = db.rounds().list(pool.id());
        List<RoundLine> page = new ArrayList<>();
        for (RoundStore.RoundRow r : all.subList(Math.min(offset, all.size()), Math.min(all.size(), offset + limit))) {
            page.add(new RoundLine(r, r.healthJson() == null ? null
                    : AdviceService.chains(r.healthJson(), r.samplerJson(), now)));
        }
        return new RoundsPage(all.size(), offset, limit, page, Progress.of(db, rounds, pool));
    }

    /** Asks for a round of the pool now, or right after the one running. */
    public void requestRound(String poolName) {
        rounds.worker(db.pools().require(poolName).name()).request();
    }

    public Settings settings(String poolName) {
        return inForce(db.pools().require(poolName));
    }

    /** Changes the fields {@code change} names in {@code actor}'s name (kept in the history); returns the settings now. */
    public Settings changeSettings(String poolName, PoolSettings.Change change, String actor) {
        PoolRow pool = db.pools().require(poolName);
        PoolSettings next = change.applyTo(PoolSettings.parse(pool.settingsJson()), rounds.sampler());
        return inForce(rounds.changeSettings(pool.name(), next, actor));
    }

    /** Every change of the pool's settings, oldest first. */
    public List<SettingsChange> settingsHistory(String poolName) {
        PoolRow pool = db.pools().require(poolName);
        List<SettingsChange> out = new ArrayList<>();
        for (HistoryStore.Change c : db.history().of(pool.id(), "settings")) {
            out.add(new SettingsChange(c.actor(), c.at(),
                    c.before() == null ? null : inForce(PoolSettings.parse(c.before())),
                    inForce(PoolSettings.parse(c.after()))));
        }
        return out;
    }

    /** The records in pool order, {@code limit} from {@code offset}, with their display fields and final label. */
    public RecordsPage records(String poolName, long offset, int limit) {
        PoolRow pool = db.pools().require(poolName);
        List<String> display = Desk.display(pool);
        List<RecordView> page = db.records().page(pool.id(), offset, limit).stream()
                .map(r -> RecordView.of(r, display)).toList();
        return new RecordsPage(pool.recordCount(), offset, limit, page);
    }

    private Settings inForce(PoolRow pool) {
        return inForce(PoolSettings.parse(pool.settingsJson()));
    }

    private Settings inForce(PoolSettings s) {
        return new Settings(s, s.sampling(rounds.sampler()));
    }
}
