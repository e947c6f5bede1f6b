package dev.dowser.cli;

import dev.dowser.labels.Verdict;
import dev.dowser.rounds.PoolSettings;
import dev.dowser.store.Database;
import dev.dowser.store.HistoryStore;
import dev.dowser.store.LabelStore;
import dev.dowser.store.PoolRow;
import dev.dowser.store.UserRow;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.ConcurrentLinkedQueue;

/**
 * Every write the server answered with success, as the client saw it, checked afterwards against
 * what the database holds. Each write carries something unique (a label's or review's note, a
 * lease length, an account name), so its row can be found again without guessing.
 */
final class AckLedger {

    /** The kinds of acknowledged writes, as reported. */
    enum Kind { LABEL, WITHDRAWAL, REVIEW, SETTINGS, ACCOUNT }

    /**
     * One acknowledged write. {@code record} and {@code person} name the record and its author;
     * {@code mark} is the unique part: a label's or review's note, the note of the label a
     * withdrawal took back, a lease length, an account's name; {@code value} the label or role.
     */
    record Ack(Kind kind, int cycle, String record, String person, String mark, String value) {
    }

    /** What the check found: per kind, writes acknowledged and writes missing, and a few of the missing. */
    record Check(Map<Kind, long[]> counts, List<Ack> missing) {

        long acknowledged() {
            return counts.values().stream().mapToLong(c -> c[0]).sum();
        }

        long lost() {
            return counts.values().stream().mapToLong(c -> c[1]).sum();
        }
    }

    private final ConcurrentLinkedQueue<Ack> acks = new ConcurrentLinkedQueue<>();

    void add(Ack ack) {
        acks.add(ack);
    }

    long size() {
        return acks.size();
    }

    /** The labels acknowledged so far and not taken back: what a reviewer may decide on. */
    List<Ack> labels() {
        return acks.stream().filter(a -> a.kind() == Kind.LABEL).toList();
    }

    /** Checks every acknowledged write of pool {@code poolName} against {@code db}. */
    Check check(Database db, String poolName) {
        PoolRow pool = db.pools().require(poolName);
        Map<Kind, long[]> counts = new LinkedHashMap<>();
        for (Kind k : Kind.values()) {
            counts.put(k, new long[2]);
        }
        Map<String, List<LabelStore.Entry>> histories = new LinkedHashMap<>();
        Set<Integer> leaseMinutes = new HashSet<>();
        for (HistoryStore.Change c : db.history().of(pool.id(), "settings")) {
            leaseMinutes.add(PoolSettings.parse(c.after()).leaseMinutes());
        }
        List<Ack> missing = new ArrayList<>();
        for (Ack a : acks) {
            boolean found = switch (a.kind()) {
                case LABEL -> labelled(history(db, pool, a.record(), histories), a) >= 0;
                case WITHDRAWAL -> withdrawn(history(db, pool, a.record(), histories), a);
                case REVIEW -> history(db, pool, a.record(), histories).stream()
                        .anyMatch(e -> e.kind().equals(Verdict.OVERRIDE.word()) && a.mark().equals(e.note())
                                && e.by().equals(a.person()) && e.label().equals(a.value()));
                case SETTINGS -> leaseMinutes.contains(Integer.parseInt(a.mark()));
                case ACCOUNT -> account(db, a);
            };
            counts.get(a.kind())[0]++;
            if (!found) {
                counts.get(a.kind())[1]++;
                missing.add(a);
            }
        }
        return new Check(counts, missing);
    }

    private static List<LabelStore.Entry> history(Database db, PoolRow pool, String record,
                                                  Map<String, List<LabelStore.Entry>> cache) {
        return cache.computeIfAbsent(record, r -> db.records().rowOf(pool.id(), r)
                .map(row -> db.labels().history(pool.id(), row)).orElse(List.of()));
    }

    /** Where the acknowledged label sits in the record's history, or -1. */
    private static int labelled(List<LabelStore.Entry> history, Ack a) {
        for (int i = 0; i < history.size(); i++) {
            LabelStore.Entry e = history.get(i);
            if (e.kind().equals(LabelStore.KIND_LABEL) && !e.withdrawn() && a.mark().equals(e.note())
                    && e.by().equals(a.person()) && e.label().equals(a.value())) {
                return i;
            }
        }
        return -1;
    }

    /** A withdrawal by the same person follows the label it took back. */
    private static boolean withdrawn(List<LabelStore.Entry> history, Ack a) {
        int at = labelled(history, new Ack(Kind.LABEL, a.cycle(), a.record(), a.person(), a.mark(), a.value()));
        if (at < 0) {
            return false;
        }
        for (int i = at + 1; i < history.size(); i++) {
            LabelStore.Entry e = history.get(i);
            if (e.kind().equals(LabelStore.KIND_LABEL) && e.withdrawn() && e.by().equals(a.person())) {
                return true;
            }
        }
        return false;
    }

    /**
     * An account add is acknowledged with its name and no value: the account exists. A role change
     * with the role it set: each account is changed at most once, so the account has that role, and
     * its history holds the change.
     */
    private static boolean account(Database db, Ack a) {
        Optional<UserRow> u = db.users().find(a.mark());
        if (u.isEmpty() || a.value() == null) {
            return u.isPresent();
        }
        return a.value().equals(u.get().role()) && db.history().of(null, "account:" + a.mark()).stream()
                .anyMatch(c -> a.value().equals(c.after()));
    }
}
