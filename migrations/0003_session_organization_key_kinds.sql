ALTER TABLE "refresh_tokens" ADD COLUMN "organization_id" uuid;--> statement-breakpoint
ALTER TABLE "refresh_tokens" ADD CONSTRAINT "refresh_tokens_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "organizations"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
-- Key kinds have our own names now: server keys and embed keys.
UPDATE "api_keys" SET "kind" = 'server' WHERE "kind" = 'secret';--> statement-breakpoint
UPDATE "api_keys" SET "kind" = 'embed' WHERE "kind" = 'publishable';
