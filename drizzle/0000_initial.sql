CREATE TYPE "public"."entry_kind" AS ENUM('measure', 'part', 'note', 'done', 'retraction', 'accept', 'redo', 'inspection', 'sign_off');--> statement-breakpoint
CREATE TYPE "public"."entry_source" AS ENUM('typed', 'voice', 'system');--> statement-breakpoint
CREATE TYPE "public"."job_state" AS ENUM('open', 'in_work', 'final_inspection', 'ready_to_invoice', 'invoiced', 'paid', 'on_hold', 'cancelled');--> statement-breakpoint
CREATE TYPE "public"."part_unit" AS ENUM('each', 'L', 'mL');--> statement-breakpoint
CREATE TYPE "public"."role" AS ENUM('owner', 'service_writer', 'foreman', 'technician');--> statement-breakpoint
CREATE TYPE "public"."verdict" AS ENUM('in', 'low', 'high', 'no_spec');--> statement-breakpoint
CREATE TABLE "attachment" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"job_id" uuid NOT NULL,
	"entry_id" uuid,
	"file_name" text NOT NULL,
	"mime" text NOT NULL,
	"bytes" integer NOT NULL,
	"storage_key" text NOT NULL,
	"thumb_key" text,
	"uploaded_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "customer" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"name" text NOT NULL,
	"phone" text,
	"email" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "job" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"number" integer NOT NULL,
	"customer_id" uuid,
	"vehicle_id" uuid,
	"odometer" integer,
	"odometer_unit" text DEFAULT 'km' NOT NULL,
	"fuel_level" text,
	"damage_notes" text,
	"concern" text DEFAULT '' NOT NULL,
	"requested_work" text,
	"promised_at" timestamp with time zone,
	"technician_id" uuid,
	"bay" text,
	"state" "job_state" DEFAULT 'open' NOT NULL,
	"state_reason" text,
	"signed_off_by" uuid,
	"signed_off_at" timestamp with time zone,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "job_procedure" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"job_id" uuid NOT NULL,
	"procedure_id" uuid,
	"name" text NOT NULL,
	"flat_rate_hours" double precision DEFAULT 0 NOT NULL,
	"position" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "job_state_change" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"job_id" uuid NOT NULL,
	"from_state" "job_state",
	"to_state" "job_state" NOT NULL,
	"reason" text,
	"by_user_id" uuid,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "job_step" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"job_id" uuid NOT NULL,
	"job_procedure_id" uuid NOT NULL,
	"procedure_step_id" uuid,
	"position" integer NOT NULL,
	"label" text NOT NULL,
	"aliases" text[] DEFAULT '{}'::text[] NOT NULL,
	"unit" text,
	"nominal" double precision,
	"min" double precision,
	"max" double precision,
	"caution" text,
	"part_id" uuid,
	"part_quantity" double precision
);
--> statement-breakpoint
CREATE TABLE "log_entry" (
	"id" uuid PRIMARY KEY NOT NULL,
	"seq" bigint GENERATED ALWAYS AS IDENTITY (sequence name "log_entry_seq_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"shop_id" uuid NOT NULL,
	"job_id" uuid NOT NULL,
	"job_step_id" uuid,
	"author_id" uuid NOT NULL,
	"kind" "entry_kind" NOT NULL,
	"raw_text" text NOT NULL,
	"source" "entry_source" NOT NULL,
	"value" double precision,
	"unit" text,
	"spec_value" double precision,
	"spec_unit" text,
	"verdict" "verdict",
	"note" text,
	"part_id" uuid,
	"part_quantity" double precision,
	"torque_tool_id" uuid,
	"tool_calibration_overdue" boolean DEFAULT false NOT NULL,
	"retracts" uuid,
	"occurred_at" timestamp with time zone NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "part" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"code" text NOT NULL,
	"description" text NOT NULL,
	"unit" "part_unit" DEFAULT 'each' NOT NULL,
	"price_minor" integer NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "procedure" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"name" text NOT NULL,
	"applies_to" text DEFAULT '' NOT NULL,
	"flat_rate_hours" double precision DEFAULT 0 NOT NULL,
	"archived_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "procedure_step" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"procedure_id" uuid NOT NULL,
	"position" integer NOT NULL,
	"label" text NOT NULL,
	"aliases" text[] DEFAULT '{}'::text[] NOT NULL,
	"unit" text,
	"nominal" double precision,
	"min" double precision,
	"max" double precision,
	"caution" text,
	"part_id" uuid,
	"part_quantity" double precision
);
--> statement-breakpoint
CREATE TABLE "session" (
	"id" text PRIMARY KEY NOT NULL,
	"user_id" uuid NOT NULL,
	"expires_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
CREATE TABLE "shop" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"currency" text DEFAULT 'EUR' NOT NULL,
	"labour_rate_minor" integer DEFAULT 0 NOT NULL,
	"tax_rate_bp" integer DEFAULT 0 NOT NULL,
	"default_tolerance_pct" double precision DEFAULT 10 NOT NULL,
	"idle_gap_minutes" integer DEFAULT 30 NOT NULL,
	"calibration_months" integer DEFAULT 12 NOT NULL,
	"bays" text[] DEFAULT '{}'::text[] NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sign_in_failure" (
	"id" bigint PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "sign_in_failure_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"email" text NOT NULL,
	"address" text NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "torque_tool" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"identifier" text NOT NULL,
	"kind" text NOT NULL,
	"range_min" double precision NOT NULL,
	"range_max" double precision NOT NULL,
	"unit" text NOT NULL,
	"calibrated_on" date,
	"interval_months" integer,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "user" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"role" "role" NOT NULL,
	"password_hash" text NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "vehicle" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"customer_id" uuid,
	"registration" text NOT NULL,
	"frame_number" text,
	"make" text NOT NULL,
	"model" text NOT NULL,
	"year" integer,
	"colour" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_job_id_job_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."job"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_entry_id_log_entry_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."log_entry"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_uploaded_by_user_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "customer" ADD CONSTRAINT "customer_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job" ADD CONSTRAINT "job_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job" ADD CONSTRAINT "job_customer_id_customer_id_fk" FOREIGN KEY ("customer_id") REFERENCES "public"."customer"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job" ADD CONSTRAINT "job_vehicle_id_vehicle_id_fk" FOREIGN KEY ("vehicle_id") REFERENCES "public"."vehicle"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job" ADD CONSTRAINT "job_technician_id_user_id_fk" FOREIGN KEY ("technician_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job" ADD CONSTRAINT "job_signed_off_by_user_id_fk" FOREIGN KEY ("signed_off_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job" ADD CONSTRAINT "job_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_procedure" ADD CONSTRAINT "job_procedure_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_procedure" ADD CONSTRAINT "job_procedure_job_id_job_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."job"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_procedure" ADD CONSTRAINT "job_procedure_procedure_id_procedure_id_fk" FOREIGN KEY ("procedure_id") REFERENCES "public"."procedure"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_state_change" ADD CONSTRAINT "job_state_change_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_state_change" ADD CONSTRAINT "job_state_change_job_id_job_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."job"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_state_change" ADD CONSTRAINT "job_state_change_by_user_id_user_id_fk" FOREIGN KEY ("by_user_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_step" ADD CONSTRAINT "job_step_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_step" ADD CONSTRAINT "job_step_job_id_job_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."job"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_step" ADD CONSTRAINT "job_step_job_procedure_id_job_procedure_id_fk" FOREIGN KEY ("job_procedure_id") REFERENCES "public"."job_procedure"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_step" ADD CONSTRAINT "job_step_procedure_step_id_procedure_step_id_fk" FOREIGN KEY ("procedure_step_id") REFERENCES "public"."procedure_step"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_step" ADD CONSTRAINT "job_step_part_id_part_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."part"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_job_id_job_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."job"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_job_step_id_job_step_id_fk" FOREIGN KEY ("job_step_id") REFERENCES "public"."job_step"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_part_id_part_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."part"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_torque_tool_id_torque_tool_id_fk" FOREIGN KEY ("torque_tool_id") REFERENCES "public"."torque_tool"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_retracts_log_entry_id_fk" FOREIGN KEY ("retracts") REFERENCES "public"."log_entry"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "part" ADD CONSTRAINT "part_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "procedure" ADD CONSTRAINT "procedure_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "procedure_step" ADD CONSTRAINT "procedure_step_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "procedure_step" ADD CONSTRAINT "procedure_step_procedure_id_procedure_id_fk" FOREIGN KEY ("procedure_id") REFERENCES "public"."procedure"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "procedure_step" ADD CONSTRAINT "procedure_step_part_id_part_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."part"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "session" ADD CONSTRAINT "session_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "torque_tool" ADD CONSTRAINT "torque_tool_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "user" ADD CONSTRAINT "user_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "vehicle" ADD CONSTRAINT "vehicle_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "vehicle" ADD CONSTRAINT "vehicle_customer_id_customer_id_fk" FOREIGN KEY ("customer_id") REFERENCES "public"."customer"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "attachment_job_idx" ON "attachment" USING btree ("job_id");--> statement-breakpoint
CREATE INDEX "attachment_entry_idx" ON "attachment" USING btree ("entry_id");--> statement-breakpoint
CREATE INDEX "customer_shop_idx" ON "customer" USING btree ("shop_id","name");--> statement-breakpoint
CREATE UNIQUE INDEX "job_shop_number_key" ON "job" USING btree ("shop_id","number");--> statement-breakpoint
CREATE INDEX "job_shop_state_idx" ON "job" USING btree ("shop_id","state");--> statement-breakpoint
CREATE INDEX "job_technician_idx" ON "job" USING btree ("technician_id");--> statement-breakpoint
CREATE INDEX "job_procedure_job_idx" ON "job_procedure" USING btree ("job_id","position");--> statement-breakpoint
CREATE INDEX "job_state_change_job_idx" ON "job_state_change" USING btree ("job_id","at");--> statement-breakpoint
CREATE INDEX "job_step_job_idx" ON "job_step" USING btree ("job_id","position");--> statement-breakpoint
CREATE INDEX "job_step_procedure_step_idx" ON "job_step" USING btree ("procedure_step_id");--> statement-breakpoint
CREATE UNIQUE INDEX "log_entry_seq_key" ON "log_entry" USING btree ("seq");--> statement-breakpoint
CREATE INDEX "log_entry_job_seq_idx" ON "log_entry" USING btree ("job_id","seq");--> statement-breakpoint
CREATE INDEX "log_entry_shop_seq_idx" ON "log_entry" USING btree ("shop_id","seq");--> statement-breakpoint
CREATE INDEX "log_entry_step_idx" ON "log_entry" USING btree ("job_step_id");--> statement-breakpoint
CREATE INDEX "log_entry_retracts_idx" ON "log_entry" USING btree ("retracts");--> statement-breakpoint
CREATE UNIQUE INDEX "part_shop_code_key" ON "part" USING btree ("shop_id","code");--> statement-breakpoint
CREATE INDEX "procedure_shop_idx" ON "procedure" USING btree ("shop_id","name");--> statement-breakpoint
CREATE INDEX "procedure_step_procedure_idx" ON "procedure_step" USING btree ("procedure_id","position");--> statement-breakpoint
CREATE INDEX "session_user_idx" ON "session" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "sign_in_failure_email_idx" ON "sign_in_failure" USING btree ("email","at");--> statement-breakpoint
CREATE INDEX "sign_in_failure_address_idx" ON "sign_in_failure" USING btree ("address","at");--> statement-breakpoint
CREATE UNIQUE INDEX "torque_tool_shop_identifier_key" ON "torque_tool" USING btree ("shop_id","identifier");--> statement-breakpoint
CREATE UNIQUE INDEX "user_email_key" ON "user" USING btree ("email");--> statement-breakpoint
CREATE INDEX "user_shop_idx" ON "user" USING btree ("shop_id");--> statement-breakpoint
CREATE INDEX "vehicle_shop_idx" ON "vehicle" USING btree ("shop_id","registration");