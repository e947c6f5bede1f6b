package dev.dowser.desk;

/** Hears of labels given and taken back, so that open pages update without a reload. */
public interface LabelEvents {

    LabelEvents NONE = (pool, record, change, labelsToNextRound) -> { };

    /** {@code change} is {@code added} or {@code withdrawn}. */
    void labelChanged(String pool, String record, String change, int labelsToNextRound);
}
