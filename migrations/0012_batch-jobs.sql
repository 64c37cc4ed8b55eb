CREATE TABLE "batch_job_rows" (
	"job_id" uuid NOT NULL,
	"idx" integer NOT NULL,
	"ref" text,
	"request" jsonb,
	"problem" jsonb,
	"answer" jsonb,
	"status" text,
	"answered_at" timestamp with time zone,
	CONSTRAINT "batch_job_rows_job_id_idx_pk" PRIMARY KEY("job_id","idx")
);
--> statement-breakpoint
CREATE TABLE "batch_jobs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"organization_id" uuid NOT NULL,
	"name" text,
	"status" text NOT NULL,
	"stop_reason" text,
	"source" text NOT NULL,
	"detail" text NOT NULL,
	"created_by_type" text NOT NULL,
	"created_by_id" text NOT NULL,
	"metered_key_id" text NOT NULL,
	"rows_total" integer DEFAULT 0 NOT NULL,
	"rows_done" integer DEFAULT 0 NOT NULL,
	"rows_ok" integer DEFAULT 0 NOT NULL,
	"rows_failed" integer DEFAULT 0 NOT NULL,
	"rows_with_failing_checks" integer DEFAULT 0 NOT NULL,
	"engine_version" text NOT NULL,
	"catalog_version" integer,
	"pricing_catalog" jsonb,
	"faults" integer DEFAULT 0 NOT NULL,
	"lease_owner" text,
	"lease_until" timestamp with time zone,
	"heartbeat_at" timestamp with time zone,
	"notified_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	"expires_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
ALTER TABLE "batch_job_rows" ADD CONSTRAINT "batch_job_rows_job_id_batch_jobs_id_fk" FOREIGN KEY ("job_id") REFERENCES "batch_jobs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_jobs" ADD CONSTRAINT "batch_jobs_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "batch_job_rows_open" ON "batch_job_rows" USING btree ("job_id","idx") WHERE answer is null;--> statement-breakpoint
CREATE INDEX "batch_jobs_org_created" ON "batch_jobs" USING btree ("organization_id","created_at","id");--> statement-breakpoint
CREATE INDEX "batch_jobs_status" ON "batch_jobs" USING btree ("status");--> statement-breakpoint
CREATE INDEX "batch_jobs_expires" ON "batch_jobs" USING btree ("expires_at");