ALTER TABLE "usage_counters" ADD COLUMN "units" bigint DEFAULT 0 NOT NULL;--> statement-breakpoint
-- Before units every admitted call used one: the rows written so far keep the quota they counted.
UPDATE "usage_counters" SET "units" = "count" - "limited";
