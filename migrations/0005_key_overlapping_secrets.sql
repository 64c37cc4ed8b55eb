ALTER TABLE "api_keys" ADD COLUMN "overlapping_secrets" jsonb DEFAULT '[]'::jsonb NOT NULL;--> statement-breakpoint
-- A secret still in its overlap keeps working: carry it over before the single columns go.
UPDATE "api_keys" SET "overlapping_secrets" = jsonb_build_array(jsonb_build_object('hash', "previous_secret_hash", 'validUntil', to_char("previous_valid_until" AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"'))) WHERE "previous_secret_hash" IS NOT NULL AND "previous_valid_until" IS NOT NULL;
