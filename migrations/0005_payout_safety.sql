CREATE TABLE "payment_exceptions" (
	"id" text PRIMARY KEY NOT NULL,
	"store_id" text NOT NULL,
	"ticket_id" text NOT NULL,
	"payment_id" text NOT NULL,
	"kind" text NOT NULL,
	"message" text NOT NULL,
	"raised_at" timestamp with time zone DEFAULT now() NOT NULL,
	"resolved_at" timestamp with time zone,
	"resolved_by" text,
	"resolution_note" text,
	CONSTRAINT "payment_exceptions_kind_valid" CHECK ("payment_exceptions"."kind" in ('payout-on-closed-ticket')),
	CONSTRAINT "payment_exceptions_resolved_complete" CHECK (("payment_exceptions"."resolved_at" is null) = ("payment_exceptions"."resolved_by" is null and "payment_exceptions"."resolution_note" is null))
);
--> statement-breakpoint
ALTER TABLE "payments" ADD COLUMN "sending_since" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "payments" ADD COLUMN "send_attempts" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "payments" ADD COLUMN "next_send_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "payments" ADD COLUMN "last_error" text;--> statement-breakpoint
ALTER TABLE "payments" ADD COLUMN "provider_reversal_id" text;--> statement-breakpoint
ALTER TABLE "payments" ADD COLUMN "recovery_note" text;--> statement-breakpoint
ALTER TABLE "payments" ADD COLUMN "completed_by" text;--> statement-breakpoint
ALTER TABLE "payments" ADD COLUMN "completed_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "provider_events" ADD COLUMN "payload" text;--> statement-breakpoint
ALTER TABLE "provider_events" ADD COLUMN "state" text DEFAULT 'applied' NOT NULL;--> statement-breakpoint
-- Events stored before the inbox were applied when they were stored; new ones start received.
ALTER TABLE "provider_events" ALTER COLUMN "state" SET DEFAULT 'received';--> statement-breakpoint
ALTER TABLE "provider_events" ADD COLUMN "attempts" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "provider_events" ADD COLUMN "next_attempt_at" timestamp with time zone DEFAULT now() NOT NULL;--> statement-breakpoint
ALTER TABLE "provider_events" ADD COLUMN "last_error" text;--> statement-breakpoint
ALTER TABLE "provider_events" ADD COLUMN "applied_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "payment_exceptions" ADD CONSTRAINT "payment_exceptions_store_id_stores_id_fk" FOREIGN KEY ("store_id") REFERENCES "public"."stores"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_exceptions" ADD CONSTRAINT "payment_exceptions_ticket_id_tickets_id_fk" FOREIGN KEY ("ticket_id") REFERENCES "public"."tickets"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_exceptions" ADD CONSTRAINT "payment_exceptions_payment_id_payments_id_fk" FOREIGN KEY ("payment_id") REFERENCES "public"."payments"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_exceptions" ADD CONSTRAINT "payment_exceptions_resolved_by_users_id_fk" FOREIGN KEY ("resolved_by") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "payment_exceptions_once" ON "payment_exceptions" USING btree ("payment_id","kind");--> statement-breakpoint
CREATE INDEX "payment_exceptions_open_idx" ON "payment_exceptions" USING btree ("store_id","resolved_at");--> statement-breakpoint
ALTER TABLE "payments" ADD CONSTRAINT "payments_completed_by_users_id_fk" FOREIGN KEY ("completed_by") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "payments_due_send_idx" ON "payments" USING btree ("state","next_send_at");--> statement-breakpoint
CREATE INDEX "provider_events_due_idx" ON "provider_events" USING btree ("state","next_attempt_at");--> statement-breakpoint
ALTER TABLE "payments" ADD CONSTRAINT "payments_electronic_reversal_confirmed" CHECK ("payments"."kind" <> 'reversal' or "payments"."method" <> 'electronic' or "payments"."state" <> 'completed' or "payments"."provider_reversal_id" is not null or "payments"."recovery_note" is not null) NOT VALID;--> statement-breakpoint
ALTER TABLE "provider_events" ADD CONSTRAINT "provider_events_state_valid" CHECK ("provider_events"."state" in ('received', 'applied', 'dead'));--> statement-breakpoint
ALTER TABLE "provider_events" ADD CONSTRAINT "provider_events_received_has_payload" CHECK ("provider_events"."state" <> 'received' or "provider_events"."payload" is not null);