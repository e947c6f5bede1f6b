-- Each queued record's place in its round's sequence of picks (1 first: the picks by score, then
-- the spot checks in the order drawn). With pick_probability it lets LURE (Farquhar, Gal &
-- Rainforth 2021) weight the record's label into an unbiased accuracy. NULL for records carried
-- over from an earlier round (their own round keeps their place) and for queues written before.
ALTER TABLE queue_entries ADD COLUMN pick_order INTEGER;

-- What each round tells about whether more labels still pay: the unlabelled records it picked
-- from (N), the agreement of its predictions on the pool's stop set with the round before's
-- (Cohen's kappa) and over how many records, and the information left in the pool (BALD summed
-- over every candidate, and over the batch's best). NULL for cold starts and earlier rounds.
ALTER TABLE rounds ADD COLUMN candidates BIGINT;
ALTER TABLE rounds ADD COLUMN agreement DOUBLE PRECISION;
ALTER TABLE rounds ADD COLUMN agreement_records INTEGER;
ALTER TABLE rounds ADD COLUMN information DOUBLE PRECISION;
ALTER TABLE rounds ADD COLUMN information_top DOUBLE PRECISION;

-- The latest round's predicted class for each record of the pool's stop set, which the next
-- round's predictions are compared with.
CREATE TABLE stop_set_predictions (
    pool_id   BIGINT              NOT NULL REFERENCES pools (id),
    round_no  INTEGER             NOT NULL,
    row_nos   BINARY LARGE OBJECT NOT NULL,  -- int64 little-endian, ascending
    classes   BINARY LARGE OBJECT NOT NULL,  -- int32 little-endian, one per row
    CONSTRAINT stop_set_predictions_pk PRIMARY KEY (pool_id)
);
