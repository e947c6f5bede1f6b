package dev.dowser.sampler;

import java.util.concurrent.atomic.AtomicBoolean;

/**
 * A request to stop sampling early, checked by every chain between two steps: a chain stops at a
 * safe point (a whole step taken, its state consistent) and the round's last states can still be
 * saved and continued. Used when the server shuts down during a round.
 */
public final class StopSignal {

    private final AtomicBoolean requested = new AtomicBoolean();

    /** A signal nobody raises, for runs that always go to the end. */
    public static StopSignal never() {
        return new StopSignal();
    }

    public void request() {
        requested.set(true);
    }

    public boolean requested() {
        return requested.get();
    }
}
