ALTER TABLE "seller_payout_accounts" ADD COLUMN "onboarding_url" text;--> statement-breakpoint
ALTER TABLE "seller_payout_accounts" ADD COLUMN "onboarding_url_expires_at" timestamp with time zone;