-- The shop is the distribution key: every unique key of a shop's table includes shop_id (the
-- primary key becomes (shop_id, id)), every foreign key between shop tables matches shop_id to
-- shop_id, and log_entry.seq counts per shop. Reference data keeps its keys: shop (the key
-- itself), user, session and sign_in_failure (DEVELOPERS.md, distribution.db.test.ts).
-- Every shop table already has shop_id NOT NULL, so nothing is filled in; rows are checked first.

-- 1. A composite foreign key refuses a child whose parent belongs to another shop: name them all
-- before changing anything, rather than failing on the first constraint.
DO $$
DECLARE
	r record;
	n bigint;
	example text;
	bad text := '';
BEGIN
	FOR r IN SELECT * FROM (VALUES
		('attachment', 'job_id', 'job'), ('attachment', 'entry_id', 'log_entry'),
		('invoice', 'job_id', 'job'), ('invoice', 'credit_for', 'invoice'),
		('invoice_line', 'invoice_id', 'invoice'), ('invoice_line', 'part_id', 'part'),
		('invoice_line', 'source_entry_id', 'log_entry'), ('invoice_line', 'source_step_id', 'job_step'),
		('job', 'customer_id', 'customer'), ('job', 'vehicle_id', 'vehicle'),
		('job_approval', 'job_id', 'job'), ('job_log_state', 'job_id', 'job'),
		('job_procedure', 'job_id', 'job'), ('job_procedure', 'procedure_id', 'procedure'),
		('job_state_change', 'job_id', 'job'), ('job_step', 'job_id', 'job'),
		('job_step', 'job_procedure_id', 'job_procedure'),
		('job_step', 'procedure_step_id', 'procedure_step'), ('job_step', 'part_id', 'part'),
		('job_step_state', 'job_step_id', 'job_step'), ('job_step_state', 'job_id', 'job'),
		('log_chain_head', 'job_id', 'job'), ('log_entry', 'job_id', 'job'),
		('log_entry', 'job_step_id', 'job_step'), ('log_entry', 'part_id', 'part'),
		('log_entry', 'torque_tool_id', 'torque_tool'), ('log_entry', 'retracts', 'log_entry'),
		('log_entry', 'responds_to', 'log_entry'), ('log_entry', 'inspection_item_id', 'inspection_item'),
		('mail_outbox', 'invoice_id', 'invoice'), ('payment', 'invoice_id', 'invoice'),
		('procedure_step', 'procedure_id', 'procedure'), ('procedure_step', 'part_id', 'part'),
		('torque_tool_check', 'torque_tool_id', 'torque_tool'), ('vehicle', 'customer_id', 'customer')
	) v(child, col, parent) LOOP
		EXECUTE format(
			'SELECT count(*), min(c.%2$I::text) FROM %1$I c JOIN %3$I p ON p.id = c.%2$I '
			'WHERE p.shop_id <> c.shop_id', r.child, r.col, r.parent) INTO n, example;
		IF n > 0 THEN
			bad := bad || format(E'\n  %s.%s: %s rows name a %s of another shop (e.g. %s)',
				r.child, r.col, n, r.parent, example);
		END IF;
	END LOOP;
	IF bad <> '' THEN
		RAISE EXCEPTION 'shop keys: rows whose parent is in another shop, put them right first:%', bad;
	END IF;
END;
$$;--> statement-breakpoint

-- 2. Drop the foreign keys between shop tables (keys to shop and user stay), then the primary keys.
DO $$
DECLARE
	r record;
BEGIN
	FOR r IN SELECT c.conrelid::regclass AS t, c.conname FROM pg_constraint c
		JOIN pg_class f ON f.oid = c.confrelid
		JOIN pg_namespace n ON n.oid = f.relnamespace AND n.nspname = 'public'
		WHERE c.contype = 'f' AND f.relname NOT IN ('shop', 'user') LOOP
		EXECUTE format('ALTER TABLE %s DROP CONSTRAINT %I', r.t, r.conname);
	END LOOP;
	FOR r IN SELECT c.conrelid::regclass AS t, c.conname FROM pg_constraint c
		JOIN pg_class t ON t.oid = c.conrelid
		JOIN pg_namespace n ON n.oid = t.relnamespace AND n.nspname = 'public'
		WHERE c.contype = 'p' AND t.relname IN ('attachment', 'customer', 'inspection_item',
			'invoice', 'invoice_line', 'job', 'job_approval', 'job_procedure', 'job_state_change',
			'job_step', 'log_entry', 'mail_outbox', 'part', 'payment', 'procedure', 'procedure_step',
			'torque_tool', 'torque_tool_check', 'vehicle', 'webhook_event') LOOP
		EXECUTE format('ALTER TABLE %s DROP CONSTRAINT %I', r.t, r.conname);
	END LOOP;
END;
$$;--> statement-breakpoint
DROP INDEX "log_entry_seq_key";--> statement-breakpoint
DROP INDEX "log_entry_shop_seq_idx";--> statement-breakpoint
DROP INDEX "invoice_customer_token_key";--> statement-breakpoint
DROP INDEX "log_entry_job_chain_key";--> statement-breakpoint
DROP INDEX "payment_provider_reference_key";--> statement-breakpoint

-- 3. The new keys. Each is a superset of a key that held, so no row can break one.
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "customer" ADD CONSTRAINT "customer_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "inspection_item" ADD CONSTRAINT "inspection_item_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "invoice" ADD CONSTRAINT "invoice_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "invoice_line" ADD CONSTRAINT "invoice_line_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "job" ADD CONSTRAINT "job_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "job_approval" ADD CONSTRAINT "job_approval_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "job_procedure" ADD CONSTRAINT "job_procedure_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "job_state_change" ADD CONSTRAINT "job_state_change_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "job_step" ADD CONSTRAINT "job_step_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "mail_outbox" ADD CONSTRAINT "mail_outbox_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "part" ADD CONSTRAINT "part_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "payment" ADD CONSTRAINT "payment_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "procedure" ADD CONSTRAINT "procedure_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "procedure_step" ADD CONSTRAINT "procedure_step_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "torque_tool" ADD CONSTRAINT "torque_tool_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "torque_tool_check" ADD CONSTRAINT "torque_tool_check_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "vehicle" ADD CONSTRAINT "vehicle_shop_id_id_pk" PRIMARY KEY("shop_id","id");--> statement-breakpoint
ALTER TABLE "webhook_event" ADD CONSTRAINT "webhook_event_shop_id_event_id_pk" PRIMARY KEY("shop_id","event_id");--> statement-breakpoint
CREATE UNIQUE INDEX "log_entry_shop_seq_key" ON "log_entry" USING btree ("shop_id","seq");--> statement-breakpoint
CREATE UNIQUE INDEX "invoice_customer_token_key" ON "invoice" USING btree ("customer_token","shop_id");--> statement-breakpoint
CREATE UNIQUE INDEX "log_entry_job_chain_key" ON "log_entry" USING btree ("shop_id","job_id","chain_pos");--> statement-breakpoint
CREATE UNIQUE INDEX "payment_provider_reference_key" ON "payment" USING btree ("shop_id","provider_reference");--> statement-breakpoint

-- 4. Foreign keys shop to shop. SET NULL names the one column it clears: shop_id stays.
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_job_id_fk" FOREIGN KEY ("shop_id","job_id") REFERENCES "public"."job"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_entry_id_fk" FOREIGN KEY ("shop_id","entry_id") REFERENCES "public"."log_entry"("shop_id","id");--> statement-breakpoint
ALTER TABLE "invoice" ADD CONSTRAINT "invoice_job_id_fk" FOREIGN KEY ("shop_id","job_id") REFERENCES "public"."job"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "invoice" ADD CONSTRAINT "invoice_credit_for_fk" FOREIGN KEY ("shop_id","credit_for") REFERENCES "public"."invoice"("shop_id","id");--> statement-breakpoint
ALTER TABLE "invoice_line" ADD CONSTRAINT "invoice_line_invoice_id_fk" FOREIGN KEY ("shop_id","invoice_id") REFERENCES "public"."invoice"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "invoice_line" ADD CONSTRAINT "invoice_line_part_id_fk" FOREIGN KEY ("shop_id","part_id") REFERENCES "public"."part"("shop_id","id") ON DELETE SET NULL ("part_id");--> statement-breakpoint
ALTER TABLE "invoice_line" ADD CONSTRAINT "invoice_line_source_entry_id_fk" FOREIGN KEY ("shop_id","source_entry_id") REFERENCES "public"."log_entry"("shop_id","id");--> statement-breakpoint
ALTER TABLE "invoice_line" ADD CONSTRAINT "invoice_line_source_step_id_fk" FOREIGN KEY ("shop_id","source_step_id") REFERENCES "public"."job_step"("shop_id","id") ON DELETE SET NULL ("source_step_id");--> statement-breakpoint
ALTER TABLE "job" ADD CONSTRAINT "job_customer_id_fk" FOREIGN KEY ("shop_id","customer_id") REFERENCES "public"."customer"("shop_id","id") ON DELETE SET NULL ("customer_id");--> statement-breakpoint
ALTER TABLE "job" ADD CONSTRAINT "job_vehicle_id_fk" FOREIGN KEY ("shop_id","vehicle_id") REFERENCES "public"."vehicle"("shop_id","id") ON DELETE SET NULL ("vehicle_id");--> statement-breakpoint
ALTER TABLE "job_approval" ADD CONSTRAINT "job_approval_job_id_fk" FOREIGN KEY ("shop_id","job_id") REFERENCES "public"."job"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "job_log_state" ADD CONSTRAINT "job_log_state_job_id_fk" FOREIGN KEY ("shop_id","job_id") REFERENCES "public"."job"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "job_procedure" ADD CONSTRAINT "job_procedure_job_id_fk" FOREIGN KEY ("shop_id","job_id") REFERENCES "public"."job"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "job_procedure" ADD CONSTRAINT "job_procedure_procedure_id_fk" FOREIGN KEY ("shop_id","procedure_id") REFERENCES "public"."procedure"("shop_id","id") ON DELETE SET NULL ("procedure_id");--> statement-breakpoint
ALTER TABLE "job_state_change" ADD CONSTRAINT "job_state_change_job_id_fk" FOREIGN KEY ("shop_id","job_id") REFERENCES "public"."job"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "job_step" ADD CONSTRAINT "job_step_job_id_fk" FOREIGN KEY ("shop_id","job_id") REFERENCES "public"."job"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "job_step" ADD CONSTRAINT "job_step_job_procedure_id_fk" FOREIGN KEY ("shop_id","job_procedure_id") REFERENCES "public"."job_procedure"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "job_step" ADD CONSTRAINT "job_step_procedure_step_id_fk" FOREIGN KEY ("shop_id","procedure_step_id") REFERENCES "public"."procedure_step"("shop_id","id") ON DELETE SET NULL ("procedure_step_id");--> statement-breakpoint
ALTER TABLE "job_step" ADD CONSTRAINT "job_step_part_id_fk" FOREIGN KEY ("shop_id","part_id") REFERENCES "public"."part"("shop_id","id") ON DELETE SET NULL ("part_id");--> statement-breakpoint
ALTER TABLE "job_step_state" ADD CONSTRAINT "job_step_state_job_step_id_fk" FOREIGN KEY ("shop_id","job_step_id") REFERENCES "public"."job_step"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "job_step_state" ADD CONSTRAINT "job_step_state_job_id_fk" FOREIGN KEY ("shop_id","job_id") REFERENCES "public"."job"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "log_chain_head" ADD CONSTRAINT "log_chain_head_job_id_fk" FOREIGN KEY ("shop_id","job_id") REFERENCES "public"."job"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_job_id_fk" FOREIGN KEY ("shop_id","job_id") REFERENCES "public"."job"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_job_step_id_fk" FOREIGN KEY ("shop_id","job_step_id") REFERENCES "public"."job_step"("shop_id","id") ON DELETE SET NULL ("job_step_id");--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_part_id_fk" FOREIGN KEY ("shop_id","part_id") REFERENCES "public"."part"("shop_id","id") ON DELETE SET NULL ("part_id");--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_torque_tool_id_fk" FOREIGN KEY ("shop_id","torque_tool_id") REFERENCES "public"."torque_tool"("shop_id","id") ON DELETE SET NULL ("torque_tool_id");--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_retracts_fk" FOREIGN KEY ("shop_id","retracts") REFERENCES "public"."log_entry"("shop_id","id");--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_responds_to_fk" FOREIGN KEY ("shop_id","responds_to") REFERENCES "public"."log_entry"("shop_id","id");--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_inspection_item_id_fk" FOREIGN KEY ("shop_id","inspection_item_id") REFERENCES "public"."inspection_item"("shop_id","id") ON DELETE SET NULL ("inspection_item_id");--> statement-breakpoint
ALTER TABLE "mail_outbox" ADD CONSTRAINT "mail_outbox_invoice_id_fk" FOREIGN KEY ("shop_id","invoice_id") REFERENCES "public"."invoice"("shop_id","id") ON DELETE SET NULL ("invoice_id");--> statement-breakpoint
ALTER TABLE "payment" ADD CONSTRAINT "payment_invoice_id_fk" FOREIGN KEY ("shop_id","invoice_id") REFERENCES "public"."invoice"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "procedure_step" ADD CONSTRAINT "procedure_step_procedure_id_fk" FOREIGN KEY ("shop_id","procedure_id") REFERENCES "public"."procedure"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "procedure_step" ADD CONSTRAINT "procedure_step_part_id_fk" FOREIGN KEY ("shop_id","part_id") REFERENCES "public"."part"("shop_id","id") ON DELETE SET NULL ("part_id");--> statement-breakpoint
ALTER TABLE "torque_tool_check" ADD CONSTRAINT "torque_tool_check_torque_tool_id_fk" FOREIGN KEY ("shop_id","torque_tool_id") REFERENCES "public"."torque_tool"("shop_id","id") ON DELETE cascade;--> statement-breakpoint
ALTER TABLE "vehicle" ADD CONSTRAINT "vehicle_customer_id_fk" FOREIGN KEY ("shop_id","customer_id") REFERENCES "public"."customer"("shop_id","id") ON DELETE SET NULL ("customer_id");--> statement-breakpoint

-- 5. log_entry.seq from the shop's own sequence, taken by the chain trigger (below) once it
-- holds the job's chain head: so a job's seqs rise in its chain's order, the entries of one
-- group-commit statement rise in the statement's order, nothing waits on the sequence, and a
-- rolled-back statement leaves gaps. Another job's commit may still land a lower seq a moment
-- later, which the live feed's catch-up allows for. Each shop's sequence continues its highest
-- seq. The sequence is made with the shop and dropped with it.
CREATE OR REPLACE FUNCTION log_seq_name(p_shop uuid) RETURNS text
LANGUAGE sql IMMUTABLE AS $$ SELECT 'log_seq_' || replace(p_shop::text, '-', '') $$;--> statement-breakpoint
CREATE OR REPLACE FUNCTION shop_log_seq() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
	IF TG_OP = 'INSERT' THEN
		EXECUTE format('CREATE SEQUENCE IF NOT EXISTS %I AS bigint', log_seq_name(NEW.id));
	ELSE
		EXECUTE format('DROP SEQUENCE IF EXISTS %I', log_seq_name(OLD.id));
	END IF;
	RETURN NULL;
END;
$$;--> statement-breakpoint
CREATE TRIGGER shop_log_seq AFTER INSERT OR DELETE ON shop
	FOR EACH ROW EXECUTE FUNCTION shop_log_seq();--> statement-breakpoint
ALTER TABLE "log_entry" ALTER COLUMN "seq" DROP IDENTITY;--> statement-breakpoint
ALTER TABLE "log_entry" ALTER COLUMN "seq" SET DEFAULT 0;--> statement-breakpoint
DO $$
DECLARE
	r record;
BEGIN
	FOR r IN SELECT s.id, (SELECT max(e.seq) FROM log_entry e WHERE e.shop_id = s.id) AS top
		FROM shop s LOOP
		EXECUTE format('CREATE SEQUENCE IF NOT EXISTS %I AS bigint', log_seq_name(r.id));
		IF r.top IS NOT NULL THEN
			PERFORM setval(log_seq_name(r.id), r.top);
		END IF;
	END LOOP;
END;
$$;--> statement-breakpoint

-- 6. Lookups inside the triggers carry shop_id, so they use the new keys; the chain trigger
-- takes the seq.
CREATE OR REPLACE FUNCTION job_steps_changed() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
	IF TG_OP = 'INSERT' THEN
		UPDATE job SET steps_version = steps_version + 1
		WHERE (shop_id, id) IN (SELECT shop_id, job_id FROM new_rows);
	ELSIF TG_OP = 'UPDATE' THEN
		UPDATE job SET steps_version = steps_version + 1
		WHERE (shop_id, id) IN (SELECT shop_id, job_id FROM new_rows
			UNION SELECT shop_id, job_id FROM old_rows);
	ELSE
		UPDATE job SET steps_version = steps_version + 1
		WHERE (shop_id, id) IN (SELECT shop_id, job_id FROM old_rows);
	END IF;
	RETURN NULL;
END;
$$;--> statement-breakpoint
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
		-- A repeated id writes nothing (`on conflict (shop_id, id) do nothing`): no new entry either.
		IF st IN ('open', 'in_work', 'final_inspection', 'on_hold')
			OR EXISTS (SELECT 1 FROM log_entry x WHERE x.shop_id = NEW.shop_id AND x.id = NEW.id) THEN
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
$$;--> statement-breakpoint
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
	IF EXISTS (SELECT 1 FROM log_entry x WHERE x.shop_id = NEW.shop_id AND x.id = NEW.id) THEN
		RETURN NEW;
	END IF;
	NEW.seq := nextval(log_seq_name(NEW.shop_id)::regclass);
	NEW.recorded_at := coalesce(NEW.recorded_at, now());
	NEW.chain_v := 2;
	NEW.chain_pos := head.pos + 1;
	NEW.prev_hash := head.hash;
	NEW.entry_hash := log_entry_hash(NEW);
	UPDATE log_chain_head SET pos = NEW.chain_pos, hash = NEW.entry_hash
		WHERE shop_id = NEW.shop_id AND job_id = NEW.job_id;
	RETURN NEW;
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
$$;
