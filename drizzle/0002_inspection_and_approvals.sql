CREATE TABLE "inspection_item" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"label" text NOT NULL,
	"position" integer NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "job_approval" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"job_id" uuid NOT NULL,
	"description" text NOT NULL,
	"approved_by" text NOT NULL,
	"channel" text NOT NULL,
	"approved_at" timestamp with time zone NOT NULL,
	"recorded_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "log_entry" ADD COLUMN "responds_to" uuid;--> statement-breakpoint
ALTER TABLE "log_entry" ADD COLUMN "inspection_item_id" uuid;--> statement-breakpoint
ALTER TABLE "inspection_item" ADD CONSTRAINT "inspection_item_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_approval" ADD CONSTRAINT "job_approval_shop_id_shop_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shop"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_approval" ADD CONSTRAINT "job_approval_job_id_job_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."job"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_approval" ADD CONSTRAINT "job_approval_recorded_by_user_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "inspection_item_shop_idx" ON "inspection_item" USING btree ("shop_id","position");--> statement-breakpoint
CREATE INDEX "job_approval_job_idx" ON "job_approval" USING btree ("job_id");--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_responds_to_log_entry_id_fk" FOREIGN KEY ("responds_to") REFERENCES "public"."log_entry"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "log_entry" ADD CONSTRAINT "log_entry_inspection_item_id_inspection_item_id_fk" FOREIGN KEY ("inspection_item_id") REFERENCES "public"."inspection_item"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "log_entry_responds_to_idx" ON "log_entry" USING btree ("responds_to");