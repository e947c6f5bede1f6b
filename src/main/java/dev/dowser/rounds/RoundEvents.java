package dev.dowser.rounds;

/** Hears about a pool's rounds as they start and end; the server turns these into server-sent events. */
public interface RoundEvents {

    /** Hears nothing. */
    RoundEvents NONE = new RoundEvents() {
        @Override
        public void roundStarted(String pool, int round) {
        }

        @Override
        public void roundEnded(String pool, RoundService.Outcome outcome) {
        }
    };

    void roundStarted(String pool, int round);

    void roundEnded(String pool, RoundService.Outcome outcome);
}
