-- A version number on each job that changes whenever its steps or procedures change, so an app
-- server can keep a job's steps in memory (the phrase engine's vocabulary is built from them)
-- and tell, from one column read with the job, whether its copy is still current. Triggers keep
-- it right for every writer: the app, scripts and a console session alike. Statement-level with
-- transition tables, so attaching a procedure of hundreds of steps bumps the job once.
ALTER TABLE "job" ADD COLUMN "steps_version" integer DEFAULT 0 NOT NULL;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION job_steps_changed() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
	IF TG_OP = 'INSERT' THEN
		UPDATE job SET steps_version = steps_version + 1
		WHERE id IN (SELECT job_id FROM new_rows);
	ELSIF TG_OP = 'UPDATE' THEN
		UPDATE job SET steps_version = steps_version + 1
		WHERE id IN (SELECT job_id FROM new_rows UNION SELECT job_id FROM old_rows);
	ELSE
		UPDATE job SET steps_version = steps_version + 1
		WHERE id IN (SELECT job_id FROM old_rows);
	END IF;
	RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER job_step_inserted AFTER INSERT ON job_step
	REFERENCING NEW TABLE AS new_rows
	FOR EACH STATEMENT EXECUTE FUNCTION job_steps_changed();
--> statement-breakpoint
CREATE TRIGGER job_step_updated AFTER UPDATE ON job_step
	REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
	FOR EACH STATEMENT EXECUTE FUNCTION job_steps_changed();
--> statement-breakpoint
CREATE TRIGGER job_step_deleted AFTER DELETE ON job_step
	REFERENCING OLD TABLE AS old_rows
	FOR EACH STATEMENT EXECUTE FUNCTION job_steps_changed();
--> statement-breakpoint
CREATE TRIGGER job_procedure_updated AFTER UPDATE ON job_procedure
	REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
	FOR EACH STATEMENT EXECUTE FUNCTION job_steps_changed();
--> statement-breakpoint
CREATE TRIGGER job_procedure_deleted AFTER DELETE ON job_procedure
	REFERENCING OLD TABLE AS old_rows
	FOR EACH STATEMENT EXECUTE FUNCTION job_steps_changed();
