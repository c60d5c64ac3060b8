-- Live updates: every new log entry is announced on the `log_entry` channel, so that every app
-- server process (each holding one LISTEN connection) can push it to its browsers. NOTIFY is
-- delivered at commit, so a rolled-back insert announces nothing. The payload carries only ids;
-- listeners read the entry itself, scoped by shop, from the table.
CREATE OR REPLACE FUNCTION log_entry_notify() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
	PERFORM pg_notify(
		'log_entry',
		json_build_object(
			'seq', NEW.seq,
			'id', NEW.id,
			'shopId', NEW.shop_id,
			'jobId', NEW.job_id,
			'kind', NEW.kind
		)::text
	);
	RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER log_entry_notify
	AFTER INSERT ON log_entry
	FOR EACH ROW EXECUTE FUNCTION log_entry_notify();
