-- What produced each round, so that its queue can be rebuilt from the database: the round's node
-- of the pool's seed tree, the sampler's configuration and the pool's settings (JSON), the last
-- label row the round read (the labels are append-only, so this fixes the labelled set), and the
-- round whose chain states it continued (NULL when the chains started afresh).
ALTER TABLE rounds ADD COLUMN seed BIGINT;
ALTER TABLE rounds ADD COLUMN sampler CHARACTER VARYING;
ALTER TABLE rounds ADD COLUMN settings CHARACTER VARYING;
ALTER TABLE rounds ADD COLUMN last_label_id BIGINT;
ALTER TABLE rounds ADD COLUMN chains_from INTEGER;

-- Chain states are kept per round (the latest two rounds' of each pool), so the states a round
-- started from are still there to rebuild it.
ALTER TABLE chain_states DROP CONSTRAINT chain_states_pk;
ALTER TABLE chain_states ADD CONSTRAINT chain_states_pk PRIMARY KEY (pool_id, round_no, chain_no);

-- The probability with which each queued record was picked, given the records picked before it
-- (Plackett-Luce for power sampling, uniform for spot checks, 1 for greedy picks); NULL for
-- queues written before it was kept.
ALTER TABLE queue_entries ADD COLUMN pick_probability DOUBLE PRECISION;
