-- Taking a label back (undo) appends a row too: it repeats the label withdrawn and is marked
-- withdrawn. A record whose newest label row is a withdrawal is unlabelled again.
ALTER TABLE labels ADD COLUMN withdrawn BOOLEAN DEFAULT FALSE NOT NULL;

-- Rounds may also end 'stopped': the server shut down mid-round, the chains were saved.
COMMENT ON COLUMN rounds.status IS 'running, published, failed or stopped';
