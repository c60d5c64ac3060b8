-- Fluids by their grade (issue 16): a step's fluid spec as the manual writes it, and on each
-- entry the grade as called out with its verdict against that spec. New nullable columns only:
-- no existing row can break them. The log stays append-only (0001's trigger is unchanged).
ALTER TABLE "procedure_step" ADD COLUMN "fluid" text;--> statement-breakpoint
ALTER TABLE "job_step" ADD COLUMN "fluid" text;--> statement-breakpoint
ALTER TABLE "log_entry" ADD COLUMN "fluid" text;--> statement-breakpoint
ALTER TABLE "log_entry" ADD COLUMN "fluid_verdict" text;--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_fluid_verdict_check"
	CHECK ("fluid_verdict" IN ('meets', 'fails', 'not_stated'));
