CREATE TABLE "outbox_messages" (
	"id" text PRIMARY KEY NOT NULL,
	"store_id" text,
	"kind" text NOT NULL,
	"to_address" text NOT NULL,
	"subject" text NOT NULL,
	"text_body" text NOT NULL,
	"html_body" text NOT NULL,
	"attach_ticket_receipt_id" text,
	"state" text DEFAULT 'pending' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"next_attempt_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_error" text,
	"sent_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "outbox_kind_valid" CHECK ("outbox_messages"."kind" in ('receipt', 'payout-confirmation', 'onboarding-link', 'portal-sign-in')),
	CONSTRAINT "outbox_state_valid" CHECK ("outbox_messages"."state" in ('pending', 'sent', 'dead')),
	CONSTRAINT "outbox_sent_has_time" CHECK (("outbox_messages"."state" = 'sent') = ("outbox_messages"."sent_at" is not null))
);
--> statement-breakpoint
CREATE TABLE "provider_events" (
	"event_id" text PRIMARY KEY NOT NULL,
	"type" text NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "seller_payout_accounts" (
	"id" text PRIMARY KEY NOT NULL,
	"store_id" text NOT NULL,
	"seller_id" text NOT NULL,
	"provider_account_id" text NOT NULL,
	"payouts_enabled" boolean DEFAULT false NOT NULL,
	"external_account_kind" text,
	"external_account_last4" text,
	"external_account_label" text,
	"instant_available" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "seller_payout_accounts_last4" CHECK ("seller_payout_accounts"."external_account_last4" is null or "seller_payout_accounts"."external_account_last4" ~ '^[0-9]{4}$')
);
--> statement-breakpoint
ALTER TABLE "payments" ADD COLUMN "provider_account_id" text;--> statement-breakpoint
ALTER TABLE "payments" ADD COLUMN "provider_transfer_id" text;--> statement-breakpoint
ALTER TABLE "payments" ADD COLUMN "provider_payout_id" text;--> statement-breakpoint
ALTER TABLE "payments" ADD COLUMN "payout_speed" text;--> statement-breakpoint
ALTER TABLE "outbox_messages" ADD CONSTRAINT "outbox_messages_store_id_stores_id_fk" FOREIGN KEY ("store_id") REFERENCES "public"."stores"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "outbox_messages" ADD CONSTRAINT "outbox_messages_attach_ticket_receipt_id_tickets_id_fk" FOREIGN KEY ("attach_ticket_receipt_id") REFERENCES "public"."tickets"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "seller_payout_accounts" ADD CONSTRAINT "seller_payout_accounts_store_id_stores_id_fk" FOREIGN KEY ("store_id") REFERENCES "public"."stores"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "seller_payout_accounts" ADD CONSTRAINT "seller_payout_accounts_seller_id_sellers_id_fk" FOREIGN KEY ("seller_id") REFERENCES "public"."sellers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "outbox_due_idx" ON "outbox_messages" USING btree ("state","next_attempt_at");--> statement-breakpoint
CREATE UNIQUE INDEX "seller_payout_accounts_seller_unique" ON "seller_payout_accounts" USING btree ("seller_id");--> statement-breakpoint
CREATE UNIQUE INDEX "seller_payout_accounts_provider_unique" ON "seller_payout_accounts" USING btree ("provider_account_id");--> statement-breakpoint
CREATE UNIQUE INDEX "payments_provider_payout_unique" ON "payments" USING btree ("provider_payout_id");--> statement-breakpoint
ALTER TABLE "payments" ADD CONSTRAINT "payments_electronic_has_account" CHECK ("payments"."method" <> 'electronic' or "payments"."kind" <> 'payout' or "payments"."provider_account_id" is not null);