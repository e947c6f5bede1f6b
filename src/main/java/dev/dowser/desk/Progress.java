package dev.dowser.desk;

/**
 * The desk's progress line: the round whose queue is served (null before the first) and how many
 * labels are still to come before the next round starts by itself.
 */
public record Progress(Integer servedRound, int labelsToNextRound) {
}
