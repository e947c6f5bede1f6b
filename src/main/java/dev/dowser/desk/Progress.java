package dev.dowser.desk;

import dev.dowser.rounds.RoundWorkers;
import dev.dowser.store.Database;
import dev.dowser.store.PoolRow;

/**
 * The desk's progress line: the round whose queue is served (null before the first) and how many
 * labels are still to come before the next round starts by itself.
 */
public record Progress(Integer servedRound, int labelsToNextRound) {

    static Progress of(Database db, RoundWorkers rounds, PoolRow pool) {
        return new Progress(db.queues().servedRound(pool.id()).orElse(null),
                rounds.worker(pool.name()).labelsToNextRound());
    }
}
