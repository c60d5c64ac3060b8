-- Service intervals on procedures, and a tamper-evident hash chain on the job log.
--
-- Each log entry stores its position in its job's log (chain_pos, 1, 2, …), the previous
-- entry's hash (prev_hash) and entry_hash = SHA-256 over its canonical JSON, which includes
-- prev_hash. A BEFORE INSERT trigger fills them in the inserting statement itself, so every
-- path (the Bench's single and group-commit appends, the Floor, the seed) gets them. The order
-- is the job's own (chain_pos), not the global seq. The canonical form is rebuilt outside the
-- database by src/lib/evidence/chain.ts (db:verify, the evidence pack): keep the two in step.
ALTER TABLE "procedure" ADD COLUMN "interval_km" integer;--> statement-breakpoint
ALTER TABLE "procedure" ADD COLUMN "interval_months" integer;--> statement-breakpoint
ALTER TABLE "procedure" ADD CONSTRAINT "procedure_interval_positive"
	CHECK (("interval_km" IS NULL OR "interval_km" > 0) AND ("interval_months" IS NULL OR "interval_months" > 0));--> statement-breakpoint
CREATE TABLE "log_chain_head" (
	"shop_id" uuid NOT NULL,
	"job_id" uuid NOT NULL,
	"pos" integer NOT NULL,
	"hash" text,
	CONSTRAINT "log_chain_head_shop_id_job_id_pk" PRIMARY KEY("shop_id","job_id")
);
--> statement-breakpoint
ALTER TABLE "log_chain_head" ADD CONSTRAINT "log_chain_head_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "log_chain_head" ADD CONSTRAINT "log_chain_head_job_id_job_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."job"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "log_entry" ADD COLUMN "chain_pos" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "log_entry" ADD COLUMN "prev_hash" text;--> statement-breakpoint
ALTER TABLE "log_entry" ADD COLUMN "entry_hash" text DEFAULT '' NOT NULL;--> statement-breakpoint
-- The canonical JSON of an entry, version 1: an object with these keys in this (code point)
-- order, no spaces; every value is null or a JSON string holding the column's text form:
-- uuids in lower case, floats in PostgreSQL's shortest exact form (extra_float_digits = 1),
-- booleans true/false, timestamps in UTC as YYYY-MM-DDTHH:MM:SS.ffffffZ.
CREATE OR REPLACE FUNCTION log_entry_canonical(e log_entry) RETURNS text
LANGUAGE plpgsql STABLE SET extra_float_digits = 1 AS $$
DECLARE
	f text[][] := ARRAY[
		['author_id', e.author_id::text],
		['id', e.id::text],
		['inspection_item_id', e.inspection_item_id::text],
		['job_id', e.job_id::text],
		['job_step_id', e.job_step_id::text],
		['kind', e.kind::text],
		['note', e.note],
		['occurred_at', to_char(e.occurred_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"')],
		['part_id', e.part_id::text],
		['part_quantity', e.part_quantity::text],
		['pos', e.chain_pos::text],
		['prev', e.prev_hash],
		['raw_text', e.raw_text],
		['recorded_at', to_char(e.recorded_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"')],
		['responds_to', e.responds_to::text],
		['retracts', e.retracts::text],
		['shop_id', e.shop_id::text],
		['source', e.source::text],
		['spec_unit', e.spec_unit],
		['spec_value', e.spec_value::text],
		['tool_calibration_overdue', e.tool_calibration_overdue::text],
		['torque_tool_id', e.torque_tool_id::text],
		['unit', e.unit],
		['v', '1'],
		['value', e.value::text],
		['verdict', e.verdict::text]
	];
	out text := '{';
BEGIN
	FOR i IN 1 .. array_length(f, 1) LOOP
		IF i > 1 THEN out := out || ','; END IF;
		out := out || to_json(f[i][1])::text || ':' || coalesce(to_json(f[i][2])::text, 'null');
	END LOOP;
	RETURN out || '}';
END;
$$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION log_entry_hash(e log_entry) RETURNS text
LANGUAGE sql STABLE AS $$
	SELECT encode(sha256(convert_to(log_entry_canonical(e), 'UTF8')), 'hex')
$$;
--> statement-breakpoint
-- Existing entries join the chain in the order they arrived; the append-only trigger stands
-- aside for this one backfill only.
ALTER TABLE log_entry DISABLE TRIGGER log_entry_no_update_delete;--> statement-breakpoint
DO $$
DECLARE
	r log_entry;
	cur_job uuid := NULL;
	pos integer := 0;
	prev text := NULL;
BEGIN
	FOR r IN SELECT * FROM log_entry ORDER BY job_id, seq LOOP
		IF cur_job IS DISTINCT FROM r.job_id THEN
			IF cur_job IS NOT NULL THEN
				INSERT INTO log_chain_head (shop_id, job_id, pos, hash)
				SELECT shop_id, id, pos, prev FROM job WHERE id = cur_job;
			END IF;
			cur_job := r.job_id;
			pos := 0;
			prev := NULL;
		END IF;
		pos := pos + 1;
		r.chain_pos := pos;
		r.prev_hash := prev;
		prev := log_entry_hash(r);
		UPDATE log_entry SET chain_pos = pos, prev_hash = r.prev_hash, entry_hash = prev
			WHERE id = r.id;
	END LOOP;
	IF cur_job IS NOT NULL THEN
		INSERT INTO log_chain_head (shop_id, job_id, pos, hash)
		SELECT shop_id, id, pos, prev FROM job WHERE id = cur_job;
	END IF;
END;
$$;
--> statement-breakpoint
ALTER TABLE log_entry ENABLE TRIGGER log_entry_no_update_delete;--> statement-breakpoint
CREATE UNIQUE INDEX "log_entry_job_chain_key" ON "log_entry" USING btree ("job_id","chain_pos");--> statement-breakpoint
-- The head row is locked first, so a job's appends take their places one after another (the
-- unique index above refuses a fork outright). A repeated id writes nothing (the insert's
-- `on conflict (id) do nothing`), so it must not move the head either. Named to fire after
-- any other BEFORE INSERT trigger (they fire in name order): a trigger that skips the row
-- after this one ran would leave the head pointing at an entry that was never written.
CREATE OR REPLACE FUNCTION log_entry_chain() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
	head record;
BEGIN
	INSERT INTO log_chain_head (shop_id, job_id, pos, hash)
		VALUES (NEW.shop_id, NEW.job_id, 0, NULL)
		ON CONFLICT (shop_id, job_id) DO NOTHING;
	SELECT h.pos, h.hash INTO head FROM log_chain_head h
		WHERE h.shop_id = NEW.shop_id AND h.job_id = NEW.job_id FOR UPDATE;
	IF EXISTS (SELECT 1 FROM log_entry x WHERE x.id = NEW.id) THEN
		RETURN NEW;
	END IF;
	NEW.recorded_at := coalesce(NEW.recorded_at, now());
	NEW.chain_pos := head.pos + 1;
	NEW.prev_hash := head.hash;
	NEW.entry_hash := log_entry_hash(NEW);
	UPDATE log_chain_head SET pos = NEW.chain_pos, hash = NEW.entry_hash
		WHERE shop_id = NEW.shop_id AND job_id = NEW.job_id;
	RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER log_entry_zz_chain
	BEFORE INSERT ON log_entry
	FOR EACH ROW EXECUTE FUNCTION log_entry_chain();
