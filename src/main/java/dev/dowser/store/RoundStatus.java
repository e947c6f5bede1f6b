package dev.dowser.store;

import dev.dowser.words.Worded;

/** How a round stands, as the rounds table keeps it. */
public enum RoundStatus implements Worded {
    /** Sampling, scoring or picking now. */
    RUNNING,
    /** Its queue is out (and served until a later round's replaces it). */
    PUBLISHED,
    /** It ended with an error, kept in its message; the queue before it stays in service. */
    FAILED,
    /** The server shut down during it: its chains were saved at a safe point, its queue not published. */
    STOPPED,
    /** The server was killed during it (found still running at the next start); nothing of it was kept. */
    INTERRUPTED;

    public static RoundStatus parse(String word) {
        return Worded.parse(RoundStatus.class, word, "round status");
    }
}
