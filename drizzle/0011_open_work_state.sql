-- State kept current as entries are appended, so what the foreman looks at every minute (the
-- out-of-spec queue, the bay board, the jobs list) costs what the open work costs, not the
-- years of history. The job log stays the truth and append-only: these two tables are derived
-- from it, kept by a trigger in the appending transaction (every insert path: the Bench's
-- group-commit batches, the Floor's answers, sign-off), and rebuilt from the log by
-- rebuild_log_state(shop) (`npm run db:rebuild-state`). Their keys start with shop_id.
CREATE TABLE "job_step_state" (
	"shop_id" uuid NOT NULL REFERENCES "shop"("id") ON DELETE CASCADE,
	"job_step_id" uuid NOT NULL REFERENCES "job_step"("id") ON DELETE CASCADE,
	"job_id" uuid NOT NULL REFERENCES "job"("id") ON DELETE CASCADE,
	-- has a live measure/done/part entry with no live redo after it
	"done" boolean DEFAULT false NOT NULL,
	-- the newest measurement that is not retracted
	"latest_measure_id" uuid,
	"latest_measure_seq" bigint,
	"latest_verdict" "verdict",
	-- that measurement is under or over and no live accept or redo answers it
	"waiting" boolean DEFAULT false NOT NULL,
	PRIMARY KEY ("shop_id", "job_step_id")
);
--> statement-breakpoint
CREATE INDEX "job_step_state_job_idx" ON "job_step_state" ("job_id");
--> statement-breakpoint
CREATE INDEX "job_step_state_waiting_idx" ON "job_step_state" ("job_id", "latest_measure_seq")
	WHERE "waiting";
--> statement-breakpoint
CREATE TABLE "job_log_state" (
	"shop_id" uuid NOT NULL REFERENCES "shop"("id") ON DELETE CASCADE,
	"job_id" uuid NOT NULL REFERENCES "job"("id") ON DELETE CASCADE,
	-- the newest occurred_at of a live entry that is not a retraction
	"last_entry_at" timestamp with time zone,
	PRIMARY KEY ("shop_id", "job_id")
);
--> statement-breakpoint
-- Jobs with entries in a time window (drift for one step).
CREATE INDEX "job_log_state_last_entry_idx" ON "job_log_state" ("shop_id", "last_entry_at");
--> statement-breakpoint
-- A step's entries newest first (the trigger reads a step's latest measurement at each append).
DROP INDEX "log_entry_step_idx";
--> statement-breakpoint
CREATE INDEX "log_entry_step_seq_idx" ON "log_entry" ("job_step_id", "seq");
--> statement-breakpoint
-- Measurements of one step over time (drift) and of one torque tool, newest first.
CREATE INDEX "log_entry_step_measure_idx" ON "log_entry" ("job_step_id", "occurred_at")
	WHERE "kind" = 'measure' AND "spec_value" IS NOT NULL;
--> statement-breakpoint
CREATE INDEX "log_entry_tool_idx" ON "log_entry" ("torque_tool_id", "occurred_at")
	WHERE "kind" = 'measure' AND "torque_tool_id" IS NOT NULL;
--> statement-breakpoint
-- The jobs list's search: customer name and registration (spaces and hyphens ignored) contain
-- the words typed.
CREATE EXTENSION IF NOT EXISTS pg_trgm;
--> statement-breakpoint
CREATE INDEX "customer_name_trgm_idx" ON "customer" USING gin (lower("name") gin_trgm_ops);
--> statement-breakpoint
CREATE INDEX "vehicle_registration_trgm_idx" ON "vehicle"
	USING gin (lower(regexp_replace("registration", '[\s-]+', '', 'g')) gin_trgm_ops);
--> statement-breakpoint
CREATE INDEX "job_shop_created_idx" ON "job" ("shop_id", "created_at");
--> statement-breakpoint
CREATE INDEX "job_shop_number_text_idx" ON "job" ("shop_id", ("number"::text) text_pattern_ops);
--> statement-breakpoint
CREATE INDEX "job_shop_customer_idx" ON "job" ("shop_id", "customer_id");
--> statement-breakpoint
CREATE INDEX "job_shop_vehicle_idx" ON "job" ("shop_id", "vehicle_id");
--> statement-breakpoint
-- One step's state, read again from the log. The row is locked first, so appends to the same
-- step take turns and each reads what the one before committed.
CREATE OR REPLACE FUNCTION refresh_job_step_state(p_shop uuid, p_step uuid) RETURNS void
LANGUAGE plpgsql AS $$
DECLARE
	v_job uuid;
	m record;
	v_done boolean;
	v_waiting boolean;
BEGIN
	SELECT job_id INTO v_job FROM job_step WHERE id = p_step AND shop_id = p_shop;
	IF v_job IS NULL THEN
		RETURN;
	END IF;
	INSERT INTO job_step_state (shop_id, job_step_id, job_id) VALUES (p_shop, p_step, v_job)
		ON CONFLICT DO NOTHING;
	PERFORM 1 FROM job_step_state WHERE shop_id = p_shop AND job_step_id = p_step FOR UPDATE;
	SELECT e.id, e.seq, e.verdict, e.fluid_verdict INTO m FROM log_entry e
	WHERE e.job_step_id = p_step AND e.shop_id = p_shop AND e.kind = 'measure'
		AND NOT EXISTS (SELECT 1 FROM log_entry r WHERE r.retracts = e.id)
	ORDER BY e.seq DESC LIMIT 1;
	SELECT EXISTS (
		SELECT 1 FROM log_entry l
		WHERE l.job_step_id = p_step AND l.shop_id = p_shop AND l.kind IN ('measure', 'done', 'part')
			AND NOT EXISTS (SELECT 1 FROM log_entry r WHERE r.retracts = l.id)
			AND NOT EXISTS (
				SELECT 1 FROM log_entry d
				WHERE d.job_step_id = p_step AND d.kind = 'redo' AND d.seq > l.seq
					AND NOT EXISTS (SELECT 1 FROM log_entry r WHERE r.retracts = d.id))
	) INTO v_done;
	v_waiting := m.id IS NOT NULL
		AND coalesce(m.verdict IN ('low', 'high') OR m.fluid_verdict = 'fails', false) AND NOT EXISTS (
		SELECT 1 FROM log_entry a
		WHERE a.responds_to = m.id AND a.kind IN ('accept', 'redo')
			AND NOT EXISTS (SELECT 1 FROM log_entry r WHERE r.retracts = a.id));
	UPDATE job_step_state
	SET done = v_done, latest_measure_id = m.id, latest_measure_seq = m.seq,
		latest_verdict = m.verdict, waiting = v_waiting
	WHERE shop_id = p_shop AND job_step_id = p_step;
END;
$$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION log_entry_keep_state() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
	t record;
	answered_step uuid;
BEGIN
	IF NEW.kind = 'retraction' THEN
		SELECT job_step_id, responds_to INTO t FROM log_entry WHERE id = NEW.retracts;
		IF t.job_step_id IS NOT NULL THEN
			PERFORM refresh_job_step_state(NEW.shop_id, t.job_step_id);
		END IF;
		IF t.responds_to IS NOT NULL THEN
			SELECT job_step_id INTO answered_step FROM log_entry WHERE id = t.responds_to;
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
	IF NEW.responds_to IS NOT NULL THEN
		SELECT job_step_id INTO answered_step FROM log_entry WHERE id = NEW.responds_to;
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
$$;
--> statement-breakpoint
CREATE TRIGGER log_entry_keep_state AFTER INSERT ON log_entry
	FOR EACH ROW EXECUTE FUNCTION log_entry_keep_state();
--> statement-breakpoint
-- The derived state of one shop, rebuilt from its whole log in a few set-based statements
-- (written apart from the trigger's per-step reading, so each checks the other).
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
END;
$$;
--> statement-breakpoint
-- Existing logs: derive the state of every shop now.
SELECT rebuild_log_state(id) FROM shop;
