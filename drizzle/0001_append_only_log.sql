-- The job log is append-only: corrections are new entries (retractions), never edits.
-- Enforced here so that no code path, script or console session can rewrite history.
CREATE OR REPLACE FUNCTION log_entry_append_only() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
	RAISE EXCEPTION 'log_entry is append-only: % is not allowed; append a retraction instead', TG_OP
		USING ERRCODE = 'restrict_violation';
END;
$$;
--> statement-breakpoint
CREATE TRIGGER log_entry_no_update_delete
	BEFORE UPDATE OR DELETE ON log_entry
	FOR EACH ROW EXECUTE FUNCTION log_entry_append_only();
--> statement-breakpoint
CREATE TRIGGER log_entry_no_truncate
	BEFORE TRUNCATE ON log_entry
	FOR EACH STATEMENT EXECUTE FUNCTION log_entry_append_only();
