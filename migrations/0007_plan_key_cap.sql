ALTER TABLE "plans" ADD COLUMN "max_api_keys" integer DEFAULT 5 NOT NULL;--> statement-breakpoint
-- Keys per organisation by plan (common practice for API platforms, no published source).
UPDATE "plans" SET "max_api_keys" = 25 WHERE "id" = 'shop';--> statement-breakpoint
UPDATE "plans" SET "max_api_keys" = 100 WHERE "id" = 'partner';--> statement-breakpoint
UPDATE "plans" SET "max_api_keys" = 1000 WHERE "id" = 'platform';
