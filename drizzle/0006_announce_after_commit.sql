-- New log entries are no longer announced by a trigger inside the inserting transaction.
-- PostgreSQL serialises the commits of all transactions that sent a NOTIFY (they hold one
-- database-wide lock until their commit record is flushed to disk), so a per-row pg_notify
-- limited every append to one disk flush at a time: 119 single-row inserts/s against 1,173/s
-- without the trigger, 50 concurrent clients on the development machine (pgbench). The app now
-- announces what it wrote right after its commit, in batches, from a transaction of its own
-- that needs no flush (src/lib/server/announce.ts); the channel and payload are unchanged.
DROP TRIGGER IF EXISTS log_entry_notify ON log_entry;
--> statement-breakpoint
DROP FUNCTION IF EXISTS log_entry_notify();
