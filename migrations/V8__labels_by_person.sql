-- The desk lists a person's latest labels ("my last labels", undo past the newest): read newest
-- first through this index instead of every label of the pool.
CREATE INDEX labels_by_person ON labels (pool_id, labelled_by, id);
