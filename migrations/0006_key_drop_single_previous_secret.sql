ALTER TABLE "api_keys" DROP COLUMN "previous_secret_hash";--> statement-breakpoint
ALTER TABLE "api_keys" DROP COLUMN "previous_valid_until";