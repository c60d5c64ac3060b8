-- An adapter on the step (issue 16): a procedure step, and its copy on a job, can say the
-- adapter it is done with (a crowfoot on a flare nut, an extension): its length in mm and how
-- it sits on the wrench ('out' along the lever, 'back' towards the hand, 'square' at 90°). The
-- Bench works out the wrench setting from it when nothing else is said or picked, and the entry
-- records it in log_entry.adapter_mm like a said adapter (hash chain version 2 already has it).
-- New nullable columns: old rows hold nulls, which the CHECKs allow; the block below still
-- counts any row that would break them and names the table, rather than fail half-way. Each
-- side is spelt out with IS NOT NULL: a CHECK passes on NULL, so a length without a direction
-- would slip through a bare IN.
ALTER TABLE "job_step" ADD COLUMN "adapter_length_mm" double precision;--> statement-breakpoint
ALTER TABLE "job_step" ADD COLUMN "adapter_direction" text;--> statement-breakpoint
ALTER TABLE "procedure_step" ADD COLUMN "adapter_length_mm" double precision;--> statement-breakpoint
ALTER TABLE "procedure_step" ADD COLUMN "adapter_direction" text;--> statement-breakpoint
DO $$
DECLARE
	bad_library bigint;
	bad_jobs bigint;
BEGIN
	SELECT count(*) INTO bad_library FROM "procedure_step"
	WHERE NOT (("adapter_length_mm" IS NULL AND "adapter_direction" IS NULL)
		OR ("adapter_length_mm" IS NOT NULL AND "adapter_direction" IS NOT NULL
			AND "adapter_length_mm" BETWEEN 0 AND 1000 AND "adapter_direction" IN ('out', 'back', 'square')));
	SELECT count(*) INTO bad_jobs FROM "job_step"
	WHERE NOT (("adapter_length_mm" IS NULL AND "adapter_direction" IS NULL)
		OR ("adapter_length_mm" IS NOT NULL AND "adapter_direction" IS NOT NULL
			AND "adapter_length_mm" BETWEEN 0 AND 1000 AND "adapter_direction" IN ('out', 'back', 'square')));
	IF bad_library > 0 OR bad_jobs > 0 THEN
		RAISE EXCEPTION 'step adapter: % procedure_step and % job_step rows have an adapter outside 0–1000 mm or without a direction', bad_library, bad_jobs;
	END IF;
END $$;--> statement-breakpoint
ALTER TABLE "procedure_step" ADD CONSTRAINT "procedure_step_adapter_check"
	CHECK (("adapter_length_mm" IS NULL AND "adapter_direction" IS NULL)
		OR ("adapter_length_mm" IS NOT NULL AND "adapter_direction" IS NOT NULL
			AND "adapter_length_mm" BETWEEN 0 AND 1000 AND "adapter_direction" IN ('out', 'back', 'square')));--> statement-breakpoint
ALTER TABLE "job_step" ADD CONSTRAINT "job_step_adapter_check"
	CHECK (("adapter_length_mm" IS NULL AND "adapter_direction" IS NULL)
		OR ("adapter_length_mm" IS NOT NULL AND "adapter_direction" IS NOT NULL
			AND "adapter_length_mm" BETWEEN 0 AND 1000 AND "adapter_direction" IN ('out', 'back', 'square')));
