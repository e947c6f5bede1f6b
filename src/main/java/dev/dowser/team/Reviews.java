package dev.dowser.team;

import dev.dowser.data.ColumnRoles;
import dev.dowser.labels.Resolution;
import dev.dowser.labels.Verdict;
import dev.dowser.store.Database;
import dev.dowser.store.LabelStore;
import dev.dowser.store.PoolRow;
import dev.dowser.store.PredictionStore;
import dev.dowser.store.QueueEntry;
import dev.dowser.store.RecordRow;
import dev.dowser.words.Worded;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Optional;
import java.util.Set;
import java.util.TreeSet;

/**
 * What the review page lists and decides: labelled records filtered by what needs a second look,
 * and a reviewer's accept or override, appended to the labels like everything else.
 */
public final class Reviews {

    /** A model this sure of a class other than the people's label is worth a look. */
    public static final double CONFIDENT = 0.9;
    public static final int MAX_PAGE = 200;

    /** Which records to list. */
    public enum Show implements Worded {
        /** every labelled record */
        ALL,
        /** people gave different labels (resolved by a reviewer or not) */
        DISAGREE,
        /** not yet resolved: people disagree and no reviewer decided */
        UNRESOLVED,
        /** the model gives at least {@link #CONFIDENT} to a class nobody chose */
        MODEL,
        /** records that were queued as spot checks */
        SPOT;

        public static Show parse(String word) {
            return Worded.parse(Show.class, word, "filter");
        }
    }

    /** The filter: which records, and optionally only one person's or one class's. */
    public record Filter(Show show, String labeller, String label) {
    }

    /** One listed record: where its labels stand, the model's view (may be null), whether it was a spot check. */
    public record Item(RecordRow record, Resolution resolution, double[] model, boolean spotCheck) {
    }

    /**
     * One page of the filtered records, how many pass the filter, everyone who labelled in the pool,
     * and the pool's display columns (the names of each record's display values).
     */
    public record Page(List<Item> items, int total, List<String> people, List<String> display) {
    }

    private final Database db;

    public Reviews(Database db) {
        this.db = db;
    }

    /** The labelled records of {@code pool} that pass {@code filter}, in pool order, {@code limit} from {@code offset}. */
    public Page find(String poolName, Filter filter, int offset, int limit) {
        PoolRow pool = db.pools().require(poolName);
        if (offset < 0 || limit < 1 || limit > MAX_PAGE) {
            throw new IllegalArgumentException("offset must be 0 or more and limit between 1 and " + MAX_PAGE);
        }
        if (filter.label() != null && !pool.classes().contains(filter.label())) {
            throw new IllegalArgumentException("'" + filter.label() + "' is not one of the classes "
                    + String.join(", ", pool.classes()));
        }
        Optional<PredictionStore.Predictions> predictions = db.predictions().latest(pool.id());
        Set<Long> spot = new HashSet<>();
        for (QueueEntry e : db.queues().spotChecks(pool.id())) {
            spot.add(e.row());
        }
        List<Resolution> found = new ArrayList<>();
        int[] total = {0};
        Set<String> people = new TreeSet<>();
        db.labels().forEachResolution(pool.id(), r -> {
            r.opinions().forEach(o -> people.add(o.person()));
            double[] model = predictions.map(p -> p.of(r.row())).orElse(null);
            if (!passes(r, model, spot.contains(r.row()), filter, pool.classes())) {
                return;
            }
            if (total[0] >= offset && found.size() < limit) {
                found.add(r);
            }
            total[0]++;
        });
        List<RecordRow> records = db.records().rows(pool.id(), found.stream().mapToLong(Resolution::row).toArray());
        List<Item> items = new ArrayList<>(found.size());
        for (int i = 0; i < found.size(); i++) {
            Resolution r = found.get(i);
            items.add(new Item(records.get(i), r, predictions.map(p -> p.of(r.row())).orElse(null),
                    spot.contains(r.row())));
        }
        return new Page(items, total[0], List.copyOf(people), ColumnRoles.parse(pool.columnRolesJson()).display());
    }

    static boolean passes(Resolution r, double[] model, boolean spotCheck, Filter f, List<String> classes) {
        if (f.labeller() != null && r.opinions().stream().noneMatch(o -> o.person().equals(f.labeller()))) {
            return false;
        }
        if (f.label() != null) {
            boolean isFinal = r.finalLabel() != null && r.finalLabel().label().equals(f.label());
            if (!isFinal && r.opinions().stream().noneMatch(o -> o.label().equals(f.label()))) {
                return false;
            }
        }
        return switch (f.show()) {
            case ALL -> true;
            case DISAGREE -> r.peopleDisagree();
            case UNRESOLVED -> r.finalLabel() == null;
            case SPOT -> spotCheck;
            case MODEL -> modelDisagrees(r, model, classes);
        };
    }

    /** The model puts at least {@link #CONFIDENT} on one class, and that class is not the record's label. */
    static boolean modelDisagrees(Resolution r, double[] model, List<String> classes) {
        if (model == null) {
            return false;
        }
        int top = 0;
        for (int c = 1; c < model.length; c++) {
            if (model[c] > model[top]) {
                top = c;
            }
        }
        if (model[top] < CONFIDENT || top >= classes.size()) {
            return false;
        }
        String sure = classes.get(top);
        if (r.finalLabel() != null) {
            return !r.finalLabel().label().equals(sure);
        }
        return r.opinions().stream().noneMatch(o -> o.label().equals(sure));
    }

    /** A reviewer's accept (the people's label becomes final) or override (a label and a reason). */
    public Resolution decide(String poolName, String record, Caller reviewer, Verdict verdict, String label,
                             String reason) {
        PoolRow pool = db.pools().require(poolName);
        long row = db.records().requireRow(pool, record);
        if (label != null) {
            pool.checkClass(label);
        }
        if (verdict == Verdict.OVERRIDE && label == null) {
            throw new IllegalArgumentException("an override needs the label you choose");
        }
        return db.labels().review(pool.id(), row, reviewer.name(), verdict, label, reason);
    }

    /** Every label, withdrawal and decision of one record, oldest first. */
    public List<LabelStore.Entry> history(String poolName, String record) {
        PoolRow pool = db.pools().require(poolName);
        return db.labels().history(pool.id(), db.records().requireRow(pool, record));
    }

    /** Agreement over every record of the pool that two or more people labelled. */
    public Agreement agreement(String poolName) {
        PoolRow pool = db.pools().require(poolName);
        List<Resolution> shared = new ArrayList<>();
        db.labels().forEachResolution(pool.id(), r -> {
            if (r.opinions().size() > 1) {
                shared.add(r);
            }
        });
        return Agreement.of(shared, pool.classes());
    }
}
