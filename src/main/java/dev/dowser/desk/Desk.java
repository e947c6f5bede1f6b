package dev.dowser.desk;

import dev.dowser.data.QueuedBelief;
import dev.dowser.data.ColumnRoles;
import dev.dowser.labels.LabelRow;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.RoundWorker;
import dev.dowser.rounds.RoundWorkers;
import dev.dowser.store.Database;
import dev.dowser.store.LabelStore;
import dev.dowser.store.PoolRow;
import dev.dowser.store.QueueEntry;
import dev.dowser.store.QueueStore;
import dev.dowser.store.RecordRow;
import dev.dowser.store.RoundStatus;
import dev.dowser.store.RoundStore;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;

/**
 * The labelling desk: the next record under a lease, a label, a skip, and taking a label back, each
 * in the name of the person at the desk. Labels never wait for a round: the pool's worker only
 * hears that one was added, and open pages hear of it through {@link LabelEvents}.
 */
public final class Desk {

    static final String NOTHING_FOR_YOU = "nothing is open for you right now: the records still open are with other"
            + " people, or are ones you labelled; the next round brings more, and this desk shows it by itself";
    static final String ALL_LABELLED = "every record of this pool has its labels; nothing is left to label";

    /** One of a person's own labels that still stands: the record's id, the label, when. */
    public record Given(String record, String label, Instant at) {
    }

    /** How many of a person's labels the desk lists, newest first, for taking back. */
    public static final int RECENT = 10;

    /** A label given: the record with its final label now, and the progress line. */
    public record Labelled(RecordView record, Progress progress) {
    }

    /** A label taken back: which label it was, the record as it stands now, and the progress line. */
    public record Withdrawn(String label, RecordView record, Progress progress) {
    }

    private final Database db;
    private final RoundWorkers rounds;
    private final LabelEvents events;

    public Desk(Database db, RoundWorkers rounds, LabelEvents events) {
        this.db = db;
        this.rounds = rounds;
        this.events = events;
    }

    /**
     * Leases the next record of the served queue to {@code person}; a record they hold comes back
     * first. When nothing is left for them, the offer says why and what to do, in words for their
     * role: {@code mayStartRounds} for reviewers and admins.
     */
    public Offer next(String poolName, String person, boolean mayStartRounds) {
        PoolRow pool = db.pools().require(poolName);
        // Read before the lease, so that the words for an empty desk describe what the lease saw: the
        // round this call asks for may publish before they are written.
        boolean served = db.queues().servedRound(pool.id()).isPresent();
        Optional<QueueEntry> next = db.leases().lease(pool.id(), person, lease(pool));
        RoundWorker worker = rounds.worker(pool.name());
        atDesk(worker, person, pool);
        if (next.isEmpty()) {
            return Offer.none(nothingLeft(pool, worker, served, mayStartRounds), progress(pool));
        }
        QueueEntry e = next.get();
        // Another person's label is not shown: a second labeller must judge on their own.
        RecordView record = view(pool, e.row()).unlabelled();
        // Sent for spot checks too; the desk keeps it hidden there unless asked, so they stay an honest test.
        boolean secondOpinion = e.copies() > 1 && !db.labels().resolution(pool.id(), e.row()).opinions().isEmpty();
        String reason = Reasons.why(e, PoolSettings.parse(pool.settingsJson()).strategy(), pool.classes(), secondOpinion);
        QueuedBelief belief = e.predictionJson() == null ? null : QueuedBelief.parse(e.predictionJson());
        return new Offer(e.round(), e.position(), e.copies(), e.spotCheck(), e.score(), e.leaseUntil(), record, belief,
                reason, secondOpinion, progress(pool), null);
    }

    /** Tells the worker {@code person} is at the desk, with the served batch's free places. */
    private void atDesk(RoundWorker worker, String person, PoolRow pool) {
        // The worker's marker before the store's count: a round that publishes between them voids the ask.
        int quiet = worker.quietAfter();
        worker.deskActive(person, quiet, db.queues().openInBatch(pool.id()));
    }

    /** Why a desk is empty, and the way out. */
    private String nothingLeft(PoolRow pool, RoundWorker worker, boolean served, boolean mayStartRounds) {
        if (served) {
            return db.labels().labelledRecords(pool.id()) >= pool.recordCount() ? ALL_LABELLED : NOTHING_FOR_YOU;
        }
        RoundStore.RoundRow latest = db.rounds().latest(pool.id()).orElse(null);
        // Published since the lease looked: the first batch is there, and the page shows it by itself.
        if (worker.busy() || latest == null || latest.status() == RoundStatus.RUNNING
                || latest.status() == RoundStatus.PUBLISHED) {
            return "the first batch of this pool is being picked; it appears here by itself in a moment";
        }
        String why = "no batch is served yet: the last round " + latest.status().word()
                + (latest.message() == null ? "" : " (" + latest.message() + ")");
        return why + (mayStartRounds ? "; once the cause is fixed, press Start a round now on the pool's overview"
                : "; ask a reviewer or an admin to start one from the pool's overview");
    }

    /** Gives {@code person}'s lease on a queue place back, and does not offer them the record again while anything else is open. */
    public void skip(String poolName, String person, int round, int position) {
        PoolRow pool = db.pools().require(poolName);
        db.leases().skip(pool.id(), round, position, person);
    }

    /** Gives {@code person}'s lease on a queue place back at once (the page closed); the record is free for anyone. */
    public void release(String poolName, String person, int round, int position) {
        PoolRow pool = db.pools().require(poolName);
        db.leases().release(pool.id(), round, position, person);
    }

    /** Labels {@code record} as {@code label} in {@code person}'s name, with an optional note. */
    public Labelled label(String poolName, String person, String record, String label, String note) {
        PoolRow pool = db.pools().require(poolName);
        if (note != null && note.length() > LabelStore.MAX_NOTE_CHARS) {
            throw new IllegalArgumentException("field 'note' may hold at most " + LabelStore.MAX_NOTE_CHARS
                    + " characters");
        }
        pool.checkClass(label);
        long row = db.records().requireRow(pool, record);
        boolean appended = db.labels().add(pool.id(), row, label, person, note == null || note.isBlank() ? null : note)
                .appended();
        RoundWorker worker = rounds.worker(pool.name());
        if (appended) {
            worker.labelAdded();
        }
        atDesk(worker, person, pool);
        if (appended) {
            events.labelChanged(pool.name(), record, "added", worker.labelsToNextRound());
        }
        return new Labelled(view(pool, row), progress(pool));
    }

    /**
     * Takes back {@code person}'s label of {@code record}; the record returns to them if the served
     * queue holds it. Refused when they have no label on it.
     */
    public Withdrawn undo(String poolName, String person, String record) {
        PoolRow pool = db.pools().require(poolName);
        long row = db.records().requireRow(pool, record);
        LabelRow withdrawn = db.labels().withdraw(pool.id(), row, person);
        db.leases().leaseRow(pool.id(), row, person, lease(pool));
        RoundWorker worker = rounds.worker(pool.name());
        worker.labelWithdrawn();
        events.labelChanged(pool.name(), record, "withdrawn", worker.labelsToNextRound());
        return new Withdrawn(withdrawn.label(), view(pool, row), progress(pool));
    }

    /**
     * {@code person}'s latest labels in the pool that still stand, newest first, at most
     * {@link #RECENT}: the desk's "my last labels", any of which can be taken back.
     */
    public List<Given> recent(String poolName, String person) {
        PoolRow pool = db.pools().require(poolName);
        List<LabelRow> mine = db.labels().latestBy(pool.id(), person, RECENT);
        List<RecordRow> records = db.records().rows(pool.id(), mine.stream().mapToLong(LabelRow::row).toArray());
        List<Given> out = new ArrayList<>(mine.size());
        for (int i = 0; i < mine.size(); i++) {
            out.add(new Given(records.get(i).key(), mine.get(i).label(), mine.get(i).labelledAt()));
        }
        return out;
    }

    /**
     * The served queue in order, each place with its record; labels are left out unless
     * {@code withLabels} (a labeller sees none, so that a second labeller judges alone).
     */
    public List<QueuePlace> served(String poolName, boolean withLabels) {
        PoolRow pool = db.pools().require(poolName);
        List<QueueStore.Served> served = db.queues().served(pool.id());
        List<RecordRow> records = db.records().rows(pool.id(), served.stream().mapToLong(s -> s.entry().row()).toArray());
        List<QueuePlace> out = new ArrayList<>(served.size());
        for (int i = 0; i < served.size(); i++) {
            QueueStore.Served s = served.get(i);
            RecordRow r = records.get(i);
            out.add(new QueuePlace(s.entry(), r.key(), s.labelled(), s.awaitingSecondLabel(),
                    withLabels ? r.label() : null));
        }
        return out;
    }

    /** The display columns of a pool's records, in their stored order. */
    static List<String> display(PoolRow pool) {
        return ColumnRoles.parse(pool.columnRolesJson()).display();
    }

    private Progress progress(PoolRow pool) {
        return Progress.of(db, rounds, pool);
    }

    private RecordView view(PoolRow pool, long row) {
        return RecordView.of(db.records().page(pool.id(), row, 1).get(0), display(pool));
    }

    private static Duration lease(PoolRow pool) {
        return Duration.ofMinutes(PoolSettings.parse(pool.settingsJson()).leaseMinutes());
    }
}
