package dev.dowser.sampler;

/**
 * How a chain runs one round, validated here.
 *
 * @param burnInSteps   steps before the first draw (for a warm start, the re-burn-in)
 * @param draws         draws kept by this chain this round
 * @param thinSteps     steps between kept draws (constant schedule)
 * @param batchRows     mini-batch size for stochastic-gradient kernels
 * @param schedule      the step-size schedule; a cyclical one keeps one draw at the end of each cycle
 * @param adaptSteps    whether the chain asks the kernel to adapt itself during burn-in
 * @param gibbsEvery    steps between Gibbs updates of hyperparameters (hierarchical prior)
 */
public record ChainConfig(int burnInSteps, int draws, int thinSteps, int batchRows, StepSchedule schedule,
                          boolean adaptSteps, int gibbsEvery) {

    public static final int DEFAULT_GIBBS_EVERY = 10;

    public ChainConfig {
        if (burnInSteps < 0) {
            throw new IllegalArgumentException("burnInSteps must be 0 or more, got " + burnInSteps);
        }
        if (draws < 1) {
            throw new IllegalArgumentException("each chain must keep at least one draw, got " + draws);
        }
        if (thinSteps < 1) {
            throw new IllegalArgumentException("thinSteps must be at least 1, got " + thinSteps);
        }
        if (batchRows < 1) {
            throw new IllegalArgumentException("batchRows must be at least 1, got " + batchRows);
        }
        if (schedule == null) {
            throw new IllegalArgumentException("a step schedule is required");
        }
        if (schedule.isCyclical() && schedule.cycles() != draws) {
            throw new IllegalArgumentException("a cyclical schedule keeps one draw per cycle: set cycles ("
                    + schedule.cycles() + ") equal to draws (" + draws + ")");
        }
        if (gibbsEvery < 1) {
            throw new IllegalArgumentException("gibbsEvery must be at least 1, got " + gibbsEvery);
        }
    }

    /** Steps in the round: burn-in, then the sampling steps. */
    public long totalSteps() {
        return burnInSteps + (long) draws * thinSteps;
    }

    /** Whether the draw is taken at step k (from 1). */
    boolean keepsDrawAt(long k) {
        long total = totalSteps();
        if (schedule.isCyclical()) {
            long period = schedule.cycleLength(total);
            return k % period == 0 || k == total;
        }
        return k > burnInSteps && (k - burnInSteps) % thinSteps == 0;
    }
}
