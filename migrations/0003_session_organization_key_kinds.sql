ALTER TABLE "refresh_tokens" ADD COLUMN "organization_id" uuid;--> statement-breakpoint
ALTER TABLE "refresh_tokens" ADD CONSTRAINT "refresh_tokens_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "organizations"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
-- Key kinds have our own names now: server keys and embed keys. Browser keys always list
-- allowed origins and server keys never do, so the origins tell the kind of an older row.
UPDATE "api_keys" SET "kind" = CASE WHEN cardinality("allowed_origins") > 0 THEN 'embed' ELSE 'server' END WHERE "kind" NOT IN ('server', 'embed');
