-- Where each chain of a pool stopped after its latest round, so a restart or the next round
-- continues it (a warm start) instead of starting over. One row per chain, replaced each round.
CREATE TABLE chain_states (
    pool_id         BIGINT            NOT NULL REFERENCES pools (id),
    chain_no        INTEGER           NOT NULL,
    round_no        INTEGER           NOT NULL,
    kernel          VARCHAR(20)       NOT NULL,
    network         CHARACTER VARYING NOT NULL,  -- JSON: the architecture the position belongs to
    position        BINARY LARGE OBJECT NOT NULL, -- float32 little-endian
    preconditioner  BINARY LARGE OBJECT,          -- float32 little-endian, preconditioned SGLD only
    hyper           CHARACTER VARYING,            -- JSON array of layer precisions, hierarchical prior only
    step_size       DOUBLE PRECISION  NOT NULL,
    step_count      BIGINT            NOT NULL,
    accepted        BIGINT            NOT NULL,
    proposed        BIGINT            NOT NULL,
    saved_at        TIMESTAMP WITH TIME ZONE NOT NULL,
    CONSTRAINT chain_states_pk PRIMARY KEY (pool_id, chain_no)
);
