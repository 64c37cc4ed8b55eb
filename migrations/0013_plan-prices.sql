ALTER TABLE "plans" ADD COLUMN "monthly_price_minor" integer;--> statement-breakpoint
ALTER TABLE "plans" ADD COLUMN "currency" text;--> statement-breakpoint
ALTER TABLE "plans" ADD COLUMN "provider_price_id" text;--> statement-breakpoint
ALTER TABLE "plans" ADD COLUMN "offered" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "plans" ADD CONSTRAINT "plans_provider_price_id_unique" UNIQUE("provider_price_id");--> statement-breakpoint
-- Starting prices (EUR a month). The provider price ids are what the local simulation sells; with a
-- real provider the operator sets each plan's provider_price_id to the price made there.
UPDATE "plans" SET "offered" = true WHERE "id" = 'free';--> statement-breakpoint
UPDATE "plans" SET "offered" = true, "monthly_price_minor" = 2900, "currency" = 'eur', "provider_price_id" = 'price_treadwise_shop_monthly' WHERE "id" = 'shop';--> statement-breakpoint
UPDATE "plans" SET "offered" = true, "monthly_price_minor" = 9900, "currency" = 'eur', "provider_price_id" = 'price_treadwise_partner_monthly' WHERE "id" = 'partner';
