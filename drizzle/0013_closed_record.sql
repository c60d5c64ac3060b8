-- A closed record takes nothing more, on every path that writes (the Bench's single and
-- group-commit appends, retractions, the Floor's answers, scripts, a console session).
--
-- Entries: a job takes entries only while it is on the floor (open, in work, final
-- inspection, on hold). Ready to invoice, invoiced, paid and cancelled refuse them; the app
-- moves a ready-to-invoice job back to in work first when work is found (entries.ts,
-- closedJob), so the refusal there only meets an append that raced the move.
-- Photos: refused once the record is closed (invoiced, paid, cancelled).
--
-- Why a trigger that takes a row lock, and not a check in the app: the app reads the job's
-- state, then inserts in another statement; a close committed in between left an entry after
-- the close. Here the job row is locked FOR SHARE in the inserting statement itself: a close
-- (transitionJob locks the row FOR UPDATE) either commits first, and this insert then sees
-- the closed state and is refused, or waits until the appending transaction has committed, so
-- the entry is in the log the close reads. FOR SHARE (not FOR UPDATE) so appends to one job do
-- not queue behind each other here (the chain head already orders them). The foreign key's
-- own lock (FOR KEY SHARE) does not block a state change, so it is not enough.
-- SQLSTATE BC409 lets the app answer 409 with words (src/lib/server/db/errors.ts).
CREATE OR REPLACE FUNCTION job_record_open() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
	st job_state;
BEGIN
	SELECT j.state INTO st FROM job j
		WHERE j.id = NEW.job_id AND j.shop_id = NEW.shop_id FOR SHARE;
	-- No such job of this shop: the foreign key answers.
	IF st IS NULL THEN
		RETURN NEW;
	END IF;
	IF TG_TABLE_NAME = 'log_entry' THEN
		-- A repeated id writes nothing (`on conflict (id) do nothing`): no new entry either.
		IF st IN ('open', 'in_work', 'final_inspection', 'on_hold')
			OR EXISTS (SELECT 1 FROM log_entry x WHERE x.id = NEW.id) THEN
			RETURN NEW;
		END IF;
		RAISE EXCEPTION 'job % is %: its record is closed and takes no more entries', NEW.job_id, st
			USING ERRCODE = 'BC409';
	END IF;
	IF st IN ('invoiced', 'paid', 'cancelled') THEN
		RAISE EXCEPTION 'job % is %: its record is closed and takes no more photos', NEW.job_id, st
			USING ERRCODE = 'BC409';
	END IF;
	RETURN NEW;
END;
$$;
--> statement-breakpoint
-- Named to fire before log_entry_zz_chain (BEFORE triggers fire in name order): a refused
-- entry never moves the chain head.
CREATE TRIGGER log_entry_job_open
	BEFORE INSERT ON log_entry
	FOR EACH ROW EXECUTE FUNCTION job_record_open();
--> statement-breakpoint
CREATE TRIGGER attachment_job_open
	BEFORE INSERT ON attachment
	FOR EACH ROW EXECUTE FUNCTION job_record_open();
--> statement-breakpoint
-- Rows already stored are kept as they are (the log is append-only); this reports any that
-- the rule above would have refused, so the shop knows of them.
DO $$
DECLARE
	n_entries integer;
	n_photos integer;
BEGIN
	WITH closed AS (
		SELECT c.job_id, min(c.at) AS at FROM job_state_change c
		WHERE c.to_state IN ('invoiced', 'paid', 'cancelled') GROUP BY c.job_id
	)
	SELECT
		(SELECT count(*) FROM log_entry e JOIN closed ON closed.job_id = e.job_id
			WHERE e.recorded_at > closed.at),
		(SELECT count(*) FROM attachment a JOIN closed ON closed.job_id = a.job_id
			WHERE a.created_at > closed.at)
	INTO n_entries, n_photos;
	IF n_entries > 0 OR n_photos > 0 THEN
		RAISE NOTICE '0013_closed_record: % entries and % photos were stored after their job''s record closed (kept; find them by comparing recorded_at / created_at with job_state_change)', n_entries, n_photos;
	END IF;
END;
$$;
