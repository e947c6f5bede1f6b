-- Leases belong to records, not to queue entries: at most one person holds a record at any moment,
-- whichever round's queue offered it, and the key says so. Publishing a new round leaves leases
-- alone, so nobody loses the record in front of them when a queue is replaced.
CREATE TABLE leases (
    pool_id      BIGINT                   NOT NULL REFERENCES pools (id),
    row_no       BIGINT                   NOT NULL,
    person       VARCHAR(100)             NOT NULL,
    lease_until  TIMESTAMP WITH TIME ZONE NOT NULL,
    CONSTRAINT leases_pk PRIMARY KEY (pool_id, row_no)
);
CREATE INDEX leases_by_person ON leases (pool_id, person);

-- The leases of the served queues move over; where one record was leased twice, the later lease.
INSERT INTO leases (pool_id, row_no, person, lease_until)
SELECT q.pool_id, q.row_no, q.leased_to, q.lease_until
FROM queue_entries q JOIN served_queues s ON s.pool_id = q.pool_id AND s.round_no = q.round_no
WHERE q.leased_to IS NOT NULL AND q.lease_until IS NOT NULL
  AND NOT EXISTS (SELECT 1 FROM queue_entries o WHERE o.pool_id = q.pool_id AND o.round_no = q.round_no
      AND o.row_no = q.row_no AND o.leased_to IS NOT NULL AND o.lease_until IS NOT NULL
      AND (o.lease_until > q.lease_until OR (o.lease_until = q.lease_until AND o.position > q.position)));
ALTER TABLE queue_entries DROP COLUMN leased_to;
ALTER TABLE queue_entries DROP COLUMN lease_until;

-- A record someone skipped: not offered to them again while anything else is open for them.
CREATE TABLE skips (
    pool_id     BIGINT                   NOT NULL REFERENCES pools (id),
    person      VARCHAR(100)             NOT NULL,
    row_no      BIGINT                   NOT NULL,
    skipped_at  TIMESTAMP WITH TIME ZONE NOT NULL,
    CONSTRAINT skips_pk PRIMARY KEY (pool_id, person, row_no)
);

-- After its batch a round queues the next-best records (reserve = TRUE): they are served once the
-- batch is taken, while the next round runs, so the desk never waits for it. When a round's queue
-- is replaced, its reserve entries nobody finished are deleted.
ALTER TABLE queue_entries ADD COLUMN reserve BOOLEAN DEFAULT FALSE NOT NULL;
