CREATE TABLE "overage_reports" (
	"organization_id" uuid NOT NULL,
	"day" date NOT NULL,
	"units" integer NOT NULL,
	"identifier" text NOT NULL,
	"reported_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "overage_reports_organization_id_day_pk" PRIMARY KEY("organization_id","day"),
	CONSTRAINT "overage_reports_identifier_unique" UNIQUE("identifier")
);
--> statement-breakpoint
ALTER TABLE "billing_accounts" ADD COLUMN "past_due_since" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "plans" ADD COLUMN "grace_days" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "plans" ADD COLUMN "overage_per_1000_minor" integer;--> statement-breakpoint
ALTER TABLE "plans" ADD COLUMN "overage_meter" text;--> statement-breakpoint
ALTER TABLE "overage_reports" ADD CONSTRAINT "overage_reports_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
-- A week's grace for the paid plans; the partner plan goes on beyond its quota, billed per 1 000
-- units through the provider meter `treadwise_units` (the shop plan stops at its quota).
UPDATE "plans" SET "grace_days" = 7 WHERE "id" IN ('shop', 'partner');--> statement-breakpoint
UPDATE "plans" SET "overage_per_1000_minor" = 40, "overage_meter" = 'treadwise_units' WHERE "id" = 'partner';
