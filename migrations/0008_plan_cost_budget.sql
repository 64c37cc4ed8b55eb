ALTER TABLE "plans" ADD COLUMN "cost_per_minute" integer DEFAULT 5000 NOT NULL;--> statement-breakpoint
-- Work units per key and minute: about 80 units per call at each plan's request rate (a 14-tread stair costs 15, the largest call about 2 600).
UPDATE "plans" SET "cost_per_minute" = 50000 WHERE "id" = 'shop';--> statement-breakpoint
UPDATE "plans" SET "cost_per_minute" = 250000 WHERE "id" = 'partner';--> statement-breakpoint
UPDATE "plans" SET "cost_per_minute" = 1000000000 WHERE "id" = 'platform';
