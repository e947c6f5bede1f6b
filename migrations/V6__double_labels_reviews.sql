-- A label row is now one of three kinds, still appended and never changed:
--   label     a person's label of a record (withdrawn = TRUE takes that person's label back)
--   accept    a reviewer accepting the record's label as final (label holds it)
--   override  a reviewer setting a different final label (note holds the reason)
-- Each person's newest label row is their opinion; the newest review row, when there is one,
-- decides the record's final label.
ALTER TABLE labels ADD COLUMN kind VARCHAR(10) DEFAULT 'label' NOT NULL;
ALTER TABLE labels ADD CONSTRAINT labels_kind_ck CHECK (kind IN ('label', 'accept', 'override'));

-- How many different people must label a queued record: 1, or 2 for the share sent to two
-- labellers so that their agreement can be measured.
ALTER TABLE queue_entries ADD COLUMN copies INTEGER DEFAULT 1 NOT NULL;

-- Whether a queued record needs no more labels (enough people labelled it, or a reviewer decided):
-- derived from the labels, kept up to date whenever a label row is appended, so that handing out
-- the next record does not recount labels for every entry of the queue.
ALTER TABLE queue_entries ADD COLUMN done BOOLEAN DEFAULT FALSE NOT NULL;
CREATE INDEX queue_entries_by_row ON queue_entries (pool_id, row_no);
-- Handing out the next record reads the open entries of the served round in queue order.
CREATE INDEX queue_entries_open ON queue_entries (pool_id, round_no, done, position);

-- The model's posterior predictive for each labelled record after the latest round, so the
-- review page can find records where a confident model disagrees with the people. Derived data,
-- one row a pool, replaced by every round: the labelled rows (int64 each) and their class
-- probabilities (float32, rows x classes), both little-endian.
CREATE TABLE labelled_predictions (
    pool_id        BIGINT                NOT NULL REFERENCES pools (id),
    round_no       INTEGER               NOT NULL,
    class_count    INTEGER               NOT NULL,
    row_nos        BINARY LARGE OBJECT   NOT NULL,
    probabilities  BINARY LARGE OBJECT   NOT NULL,
    CONSTRAINT labelled_predictions_pk PRIMARY KEY (pool_id)
);
