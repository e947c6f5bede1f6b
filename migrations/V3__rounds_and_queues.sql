-- Rounds and the queues they publish. A round picks records to label; its queue is served, one
-- record to one person at a time under a lease, until the next round's queue replaces it.
CREATE TABLE rounds (
    pool_id          BIGINT            NOT NULL REFERENCES pools (id),
    round_no         INTEGER           NOT NULL,
    status           VARCHAR(20)       NOT NULL,  -- running, published, failed
    started_at       TIMESTAMP WITH TIME ZONE NOT NULL,
    finished_at      TIMESTAMP WITH TIME ZONE,
    labels_at_start  BIGINT            NOT NULL,
    kernel           VARCHAR(20),
    message          CHARACTER VARYING,           -- why it failed, or the kernel's reason
    health           CHARACTER VARYING,           -- JSON: R-hat, ESS, acceptance, divergences, advice
    CONSTRAINT rounds_pk PRIMARY KEY (pool_id, round_no)
);

CREATE TABLE queue_entries (
    pool_id      BIGINT            NOT NULL REFERENCES pools (id),
    round_no     INTEGER           NOT NULL,
    position     INTEGER           NOT NULL,  -- 0 is served first
    row_no       BIGINT            NOT NULL,
    score        DOUBLE PRECISION  NOT NULL,
    spot_check   BOOLEAN           NOT NULL,
    prediction   CHARACTER VARYING,           -- JSON: mean class probabilities when queued
    leased_to    VARCHAR(100),
    lease_until  TIMESTAMP WITH TIME ZONE,
    CONSTRAINT queue_entries_pk PRIMARY KEY (pool_id, round_no, position)
);

-- Which round's queue is being served for each pool: switched in the same transaction that
-- writes the queue, so a new queue appears all at once.
CREATE TABLE served_queues (
    pool_id   BIGINT  NOT NULL REFERENCES pools (id),
    round_no  INTEGER NOT NULL,
    CONSTRAINT served_queues_pk PRIMARY KEY (pool_id)
);
