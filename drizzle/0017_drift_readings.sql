-- Drift for one step or one torque tool (issue: cost follows the open work). Read from the log,
-- each reading in a window cost about 15 pages: its job, its step and the retraction check. This
-- table holds every live measurement that has a value in its spec's unit, with what drift draws,
-- so a window is one index range. Derived like job_step_state (0011): kept by the append trigger
-- (a measurement adds its row, a retraction deletes it) and by a trigger on job_step (a spec,
-- label or library link edited), rebuilt by rebuild_log_state(shop); the log stays the truth.
CREATE TABLE "drift_reading" (
	"shop_id" uuid NOT NULL,
	"job_step_id" uuid NOT NULL,
	"entry_id" uuid NOT NULL,
	"job_id" uuid NOT NULL,
	"procedure_step_id" uuid,
	"torque_tool_id" uuid,
	"occurred_at" timestamp with time zone NOT NULL,
	"value" double precision NOT NULL,
	"unit" text NOT NULL,
	"step_unit" text,
	"nominal" double precision,
	"label" text NOT NULL,
	"verdict" "verdict",
	"job_number" integer NOT NULL,
	CONSTRAINT "drift_reading_shop_id_job_step_id_entry_id_pk" PRIMARY KEY("shop_id","job_step_id","entry_id")
);
--> statement-breakpoint
ALTER TABLE "drift_reading" ADD CONSTRAINT "drift_reading_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "drift_reading" ADD CONSTRAINT "drift_reading_job_step_id_fk" FOREIGN KEY ("shop_id","job_step_id") REFERENCES "public"."job_step"("shop_id","id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "drift_reading_step_idx" ON "drift_reading" USING btree ("shop_id","procedure_step_id","occurred_at") WHERE "drift_reading"."procedure_step_id" is not null;--> statement-breakpoint
CREATE INDEX "drift_reading_tool_idx" ON "drift_reading" USING btree ("shop_id","torque_tool_id","occurred_at") WHERE "drift_reading"."torque_tool_id" is not null;
--> statement-breakpoint
-- Nothing else reads measurements by step and time or by tool and time from the log.
DROP INDEX "log_entry_step_measure_idx";--> statement-breakpoint
DROP INDEX "log_entry_tool_idx";--> statement-breakpoint
-- One shop's readings, read again from its whole log.
CREATE OR REPLACE FUNCTION rebuild_drift_readings(p_shop uuid) RETURNS void
LANGUAGE plpgsql AS $$
BEGIN
	DELETE FROM drift_reading WHERE shop_id = p_shop;
	INSERT INTO drift_reading (shop_id, job_step_id, entry_id, job_id, procedure_step_id,
		torque_tool_id, occurred_at, value, unit, step_unit, nominal, label, verdict, job_number)
	SELECT e.shop_id, st.id, e.id, e.job_id, st.procedure_step_id, e.torque_tool_id, e.occurred_at,
		e.spec_value, e.spec_unit, st.unit, coalesce(st.nominal, (st.min + st.max) / 2), st.label,
		e.verdict, j.number
	FROM log_entry e
	JOIN job_step st ON st.id = e.job_step_id AND st.shop_id = e.shop_id
	JOIN job j ON j.id = st.job_id AND j.shop_id = st.shop_id
	WHERE e.shop_id = p_shop AND e.kind = 'measure' AND e.spec_value IS NOT NULL
		AND e.spec_unit IS NOT NULL
		AND NOT EXISTS (SELECT 1 FROM log_entry r WHERE r.retracts = e.id AND r.shop_id = e.shop_id);
END;
$$;--> statement-breakpoint
CREATE OR REPLACE FUNCTION rebuild_log_state(p_shop uuid) RETURNS void
LANGUAGE plpgsql AS $$
BEGIN
	DELETE FROM job_step_state WHERE shop_id = p_shop;
	DELETE FROM job_log_state WHERE shop_id = p_shop;
	INSERT INTO job_step_state (shop_id, job_step_id, job_id, done, latest_measure_id,
		latest_measure_seq, latest_verdict, waiting)
	WITH live AS (
		SELECT e.id, e.seq, e.job_step_id, e.kind, e.verdict, e.fluid_verdict FROM log_entry e
		WHERE e.shop_id = p_shop AND e.job_step_id IS NOT NULL AND e.kind <> 'retraction'
			AND NOT EXISTS (SELECT 1 FROM log_entry r WHERE r.retracts = e.id)
	),
	latest AS (
		SELECT DISTINCT ON (job_step_id) job_step_id, id, seq, verdict, fluid_verdict FROM live
		WHERE kind = 'measure' ORDER BY job_step_id, seq DESC
	),
	work AS (
		SELECT job_step_id, max(seq) FILTER (WHERE kind IN ('measure', 'done', 'part')) AS work_seq,
			max(seq) FILTER (WHERE kind = 'redo') AS redo_seq
		FROM live GROUP BY job_step_id
	),
	answered AS (
		SELECT DISTINCT a.responds_to AS id FROM log_entry a
		WHERE a.shop_id = p_shop AND a.kind IN ('accept', 'redo') AND a.responds_to IS NOT NULL
			AND NOT EXISTS (SELECT 1 FROM log_entry r WHERE r.retracts = a.id)
	)
	SELECT st.shop_id, st.id, st.job_id,
		w.work_seq IS NOT NULL AND w.work_seq > coalesce(w.redo_seq, 0),
		l.id, l.seq, l.verdict,
		coalesce(l.verdict IN ('low', 'high') OR l.fluid_verdict = 'fails', false) AND ans.id IS NULL
	FROM work w
	JOIN job_step st ON st.id = w.job_step_id AND st.shop_id = p_shop
	LEFT JOIN latest l ON l.job_step_id = w.job_step_id
	LEFT JOIN answered ans ON ans.id = l.id
	WHERE w.work_seq IS NOT NULL OR l.id IS NOT NULL;
	INSERT INTO job_log_state (shop_id, job_id, last_entry_at)
	SELECT p_shop, e.job_id, max(e.occurred_at) FROM log_entry e
	WHERE e.shop_id = p_shop AND e.kind <> 'retraction'
		AND NOT EXISTS (SELECT 1 FROM log_entry r WHERE r.retracts = e.id)
	GROUP BY e.job_id;
	PERFORM rebuild_drift_readings(p_shop);
END;
$$;--> statement-breakpoint
CREATE OR REPLACE FUNCTION log_entry_keep_state() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
	t record;
	answered_step uuid;
BEGIN
	IF NEW.kind = 'retraction' THEN
		SELECT job_step_id, responds_to INTO t FROM log_entry
			WHERE shop_id = NEW.shop_id AND id = NEW.retracts;
		IF t.job_step_id IS NOT NULL THEN
			PERFORM refresh_job_step_state(NEW.shop_id, t.job_step_id);
			DELETE FROM drift_reading
			WHERE shop_id = NEW.shop_id AND job_step_id = t.job_step_id AND entry_id = NEW.retracts;
		END IF;
		IF t.responds_to IS NOT NULL THEN
			SELECT job_step_id INTO answered_step FROM log_entry
				WHERE shop_id = NEW.shop_id AND id = t.responds_to;
			IF answered_step IS NOT NULL AND answered_step IS DISTINCT FROM t.job_step_id THEN
				PERFORM refresh_job_step_state(NEW.shop_id, answered_step);
			END IF;
		END IF;
		-- the retracted entry may have been the job's newest
		INSERT INTO job_log_state (shop_id, job_id, last_entry_at)
		SELECT NEW.shop_id, NEW.job_id, max(e.occurred_at) FROM log_entry e
		WHERE e.job_id = NEW.job_id AND e.shop_id = NEW.shop_id AND e.kind <> 'retraction'
			AND NOT EXISTS (SELECT 1 FROM log_entry r WHERE r.retracts = e.id)
		ON CONFLICT (shop_id, job_id) DO UPDATE SET last_entry_at = EXCLUDED.last_entry_at;
		RETURN NULL;
	END IF;
	IF NEW.job_step_id IS NOT NULL AND NEW.kind IN ('measure', 'done', 'part', 'redo', 'accept') THEN
		PERFORM refresh_job_step_state(NEW.shop_id, NEW.job_step_id);
	END IF;
	IF NEW.kind = 'measure' AND NEW.job_step_id IS NOT NULL AND NEW.spec_value IS NOT NULL
		AND NEW.spec_unit IS NOT NULL THEN
		INSERT INTO drift_reading (shop_id, job_step_id, entry_id, job_id, procedure_step_id,
			torque_tool_id, occurred_at, value, unit, step_unit, nominal, label, verdict, job_number)
		SELECT NEW.shop_id, st.id, NEW.id, NEW.job_id, st.procedure_step_id, NEW.torque_tool_id,
			NEW.occurred_at, NEW.spec_value, NEW.spec_unit, st.unit,
			coalesce(st.nominal, (st.min + st.max) / 2), st.label, NEW.verdict, j.number
		FROM job_step st JOIN job j ON j.id = st.job_id AND j.shop_id = st.shop_id
		WHERE st.id = NEW.job_step_id AND st.shop_id = NEW.shop_id;
	END IF;
	IF NEW.responds_to IS NOT NULL THEN
		SELECT job_step_id INTO answered_step FROM log_entry
			WHERE shop_id = NEW.shop_id AND id = NEW.responds_to;
		IF answered_step IS NOT NULL AND answered_step IS DISTINCT FROM NEW.job_step_id THEN
			PERFORM refresh_job_step_state(NEW.shop_id, answered_step);
		END IF;
	END IF;
	INSERT INTO job_log_state (shop_id, job_id, last_entry_at)
	VALUES (NEW.shop_id, NEW.job_id, NEW.occurred_at)
	ON CONFLICT (shop_id, job_id) DO UPDATE
		SET last_entry_at = greatest(job_log_state.last_entry_at, EXCLUDED.last_entry_at);
	RETURN NULL;
END;
$$;--> statement-breakpoint
-- A job step's spec, label or library link edited: its readings follow.
CREATE OR REPLACE FUNCTION job_step_keep_drift() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
	UPDATE drift_reading
	SET procedure_step_id = NEW.procedure_step_id, step_unit = NEW.unit,
		nominal = coalesce(NEW.nominal, (NEW.min + NEW.max) / 2), label = NEW.label
	WHERE shop_id = NEW.shop_id AND job_step_id = NEW.id;
	RETURN NULL;
END;
$$;--> statement-breakpoint
-- No column list (UPDATE OF …): a library step's deletion sets procedure_step_id by the foreign
-- key's own action, and the WHEN below catches that too.
CREATE TRIGGER job_step_keep_drift AFTER UPDATE ON job_step FOR EACH ROW
	WHEN (OLD.procedure_step_id IS DISTINCT FROM NEW.procedure_step_id
		OR OLD.unit IS DISTINCT FROM NEW.unit OR OLD.nominal IS DISTINCT FROM NEW.nominal
		OR OLD.min IS DISTINCT FROM NEW.min OR OLD.max IS DISTINCT FROM NEW.max
		OR OLD.label IS DISTINCT FROM NEW.label)
	EXECUTE FUNCTION job_step_keep_drift();--> statement-breakpoint
-- Existing logs: every shop's readings now.
SELECT rebuild_drift_readings(id) FROM shop;
