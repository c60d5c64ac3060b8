-- Torque through an adapter, the wrench's own check, fluids on the price list by grade (issue 16).
--
-- New nullable columns and a new table: no existing row can break the new CHECKs (each names
-- only new columns, all null on old rows). log_entry gains the adapter, the wrench's effective
-- length and the setting worked out, and the hash chain's canonical form goes to version 2,
-- which also takes in the fluid grade and its verdict (0007's columns, left out of version 1).
-- Entries written before this keep chain_v = 1 and their version 1 hashes; the chain trigger
-- writes every new entry as version 2. src/lib/evidence/chain.ts rebuilds both versions.
CREATE TABLE "torque_tool_check" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"torque_tool_id" uuid NOT NULL,
	"checked_on" date NOT NULL,
	"checked_by" text NOT NULL,
	"tester" text DEFAULT '' NOT NULL,
	"points" jsonb NOT NULL,
	"unit" text NOT NULL,
	"permissible_pct" double precision NOT NULL,
	"worst_pct" double precision NOT NULL,
	"passed" boolean NOT NULL,
	"note" text,
	"recorded_by" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "log_entry" ADD COLUMN "adapter_mm" double precision;--> statement-breakpoint
ALTER TABLE "log_entry" ADD COLUMN "tool_length_mm" double precision;--> statement-breakpoint
ALTER TABLE "log_entry" ADD COLUMN "wrench_setting" double precision;--> statement-breakpoint
ALTER TABLE "log_entry" ADD COLUMN "wrench_setting_unit" text;--> statement-breakpoint
-- Old rows are version 1; the default moves to 2 only after they have taken 1.
ALTER TABLE "log_entry" ADD COLUMN "chain_v" smallint DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "log_entry" ALTER COLUMN "chain_v" SET DEFAULT 2;--> statement-breakpoint
ALTER TABLE "part" ADD COLUMN "fluid" text;--> statement-breakpoint
ALTER TABLE "torque_tool" ADD COLUMN "effective_length_mm" double precision;--> statement-breakpoint
ALTER TABLE "torque_tool_check" ADD CONSTRAINT "torque_tool_check_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "torque_tool_check" ADD CONSTRAINT "torque_tool_check_torque_tool_id_torque_tool_id_fk" FOREIGN KEY ("torque_tool_id") REFERENCES "public"."torque_tool"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "torque_tool_check" ADD CONSTRAINT "torque_tool_check_recorded_by_user_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "torque_tool_check_tool_idx" ON "torque_tool_check" USING btree ("torque_tool_id","checked_on");--> statement-breakpoint
ALTER TABLE "torque_tool" ADD CONSTRAINT "torque_tool_effective_length_check"
	CHECK ("effective_length_mm" IS NULL OR ("effective_length_mm" > 0 AND "effective_length_mm" <= 3000));--> statement-breakpoint
ALTER TABLE "torque_tool_check" ADD CONSTRAINT "torque_tool_check_pct_check"
	CHECK ("permissible_pct" > 0 AND "permissible_pct" <= 50);--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_adapter_check"
	CHECK (("adapter_mm" IS NULL OR abs("adapter_mm") <= 1000)
		AND ("tool_length_mm" IS NULL OR "tool_length_mm" > 0)
		AND ("wrench_setting" IS NULL OR "wrench_setting" > 0));--> statement-breakpoint
-- The canonical JSON (see 0010): version 1 for entries hashed before this migration, version 2
-- (version 1's keys plus adapter_mm, fluid, fluid_verdict, tool_length_mm, wrench_setting and
-- wrench_setting_unit, all in code point order) for every entry since.
CREATE OR REPLACE FUNCTION log_entry_canonical(e log_entry) RETURNS text
LANGUAGE plpgsql STABLE SET extra_float_digits = 1 AS $$
DECLARE
	f text[][];
	out text := '{';
BEGIN
	IF e.chain_v = 1 THEN
		f := ARRAY[
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
	ELSE
		f := ARRAY[
			['adapter_mm', e.adapter_mm::text],
			['author_id', e.author_id::text],
			['fluid', e.fluid],
			['fluid_verdict', e.fluid_verdict],
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
			['tool_length_mm', e.tool_length_mm::text],
			['torque_tool_id', e.torque_tool_id::text],
			['unit', e.unit],
			['v', e.chain_v::text],
			['value', e.value::text],
			['verdict', e.verdict::text],
			['wrench_setting', e.wrench_setting::text],
			['wrench_setting_unit', e.wrench_setting_unit]
		];
	END IF;
	FOR i IN 1 .. array_length(f, 1) LOOP
		IF i > 1 THEN out := out || ','; END IF;
		out := out || to_json(f[i][1])::text || ':' || coalesce(to_json(f[i][2])::text, 'null');
	END LOOP;
	RETURN out || '}';
END;
$$;
--> statement-breakpoint
-- As in 0010, with one change: every new entry is hashed as version 2, whatever the insert says.
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
	NEW.chain_v := 2;
	NEW.chain_pos := head.pos + 1;
	NEW.prev_hash := head.hash;
	NEW.entry_hash := log_entry_hash(NEW);
	UPDATE log_chain_head SET pos = NEW.chain_pos, hash = NEW.entry_hash
		WHERE shop_id = NEW.shop_id AND job_id = NEW.job_id;
	RETURN NEW;
END;
$$;
