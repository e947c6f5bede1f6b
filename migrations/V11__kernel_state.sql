-- Each kernel keeps its own state between rounds and stores it as bytes it reads back itself
-- (preconditioned SGLD: the running mean square of the gradient, float32 little-endian, as the
-- preconditioner column held; MALA: its accepted and proposed counts; SGHMC: its momentum), so a
-- new kernel needs no column of its own. MALA's counts kept before this move are not carried over:
-- such a chain continues with fresh counts and its step size tuned again.
ALTER TABLE chain_states ADD COLUMN kernel_state BINARY LARGE OBJECT;
UPDATE chain_states SET kernel_state = preconditioner;
ALTER TABLE chain_states DROP COLUMN preconditioner;
ALTER TABLE chain_states DROP COLUMN accepted;
ALTER TABLE chain_states DROP COLUMN proposed;
