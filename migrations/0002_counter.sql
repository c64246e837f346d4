CREATE TABLE "cash_drawers" (
	"id" text PRIMARY KEY NOT NULL,
	"store_id" text NOT NULL,
	"clerk_id" text NOT NULL,
	"currency" text NOT NULL,
	"float_minor" bigint NOT NULL,
	"opened_at" timestamp with time zone DEFAULT now() NOT NULL,
	"closed_at" timestamp with time zone,
	"closed_by" text,
	"counted_minor" bigint,
	"expected_minor" bigint,
	CONSTRAINT "cash_drawers_float_nonnegative" CHECK ("cash_drawers"."float_minor" >= 0),
	CONSTRAINT "cash_drawers_closed_complete" CHECK (("cash_drawers"."closed_at" is null) = ("cash_drawers"."counted_minor" is null and "cash_drawers"."closed_by" is null and "cash_drawers"."expected_minor" is null))
);
--> statement-breakpoint
CREATE TABLE "payments" (
	"id" text PRIMARY KEY NOT NULL,
	"store_id" text NOT NULL,
	"ticket_id" text NOT NULL,
	"kind" text DEFAULT 'payout' NOT NULL,
	"reverses_payment_id" text,
	"method" text NOT NULL,
	"state" text NOT NULL,
	"amount_minor" bigint NOT NULL,
	"currency" text NOT NULL,
	"drawer_id" text,
	"check_number" text,
	"failure_reason" text,
	"created_by" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "payments_kind_valid" CHECK ("payments"."kind" in ('payout', 'reversal')),
	CONSTRAINT "payments_method_valid" CHECK ("payments"."method" in ('cash', 'check', 'electronic')),
	CONSTRAINT "payments_state_valid" CHECK ("payments"."state" in ('pending', 'completed', 'failed')),
	CONSTRAINT "payments_amount_positive" CHECK ("payments"."amount_minor" > 0),
	CONSTRAINT "payments_cash_has_drawer" CHECK ("payments"."method" <> 'cash' or "payments"."drawer_id" is not null),
	CONSTRAINT "payments_check_has_number" CHECK ("payments"."method" <> 'check' or "payments"."kind" <> 'payout' or "payments"."check_number" is not null),
	CONSTRAINT "payments_reversal_refers" CHECK (("payments"."kind" = 'reversal') = ("payments"."reverses_payment_id" is not null))
);
--> statement-breakpoint
CREATE TABLE "photos" (
	"id" text PRIMARY KEY NOT NULL,
	"store_id" text NOT NULL,
	"kind" text NOT NULL,
	"seller_id" text,
	"ticket_id" text,
	"line_id" text,
	"object_key" text NOT NULL,
	"content_type" text NOT NULL,
	"byte_size" integer NOT NULL,
	"sha256" text NOT NULL,
	"uploaded_by" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "photos_kind_valid" CHECK ("photos"."kind" in ('id-document', 'item')),
	CONSTRAINT "photos_content_type_valid" CHECK ("photos"."content_type" in ('image/jpeg', 'image/png', 'image/webp')),
	CONSTRAINT "photos_size_limit" CHECK ("photos"."byte_size" > 0 and "photos"."byte_size" <= 10485760),
	CONSTRAINT "photos_belongs" CHECK ("photos"."seller_id" is not null or "photos"."ticket_id" is not null)
);
--> statement-breakpoint
CREATE TABLE "rate_approvals" (
	"id" text PRIMARY KEY NOT NULL,
	"store_id" text NOT NULL,
	"ticket_id" text NOT NULL,
	"line_id" text,
	"requested_by" text NOT NULL,
	"raise_points" numeric(6, 2) NOT NULL,
	"state" text DEFAULT 'pending' NOT NULL,
	"decided_by" text,
	"decided_at" timestamp with time zone,
	"note" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "rate_approvals_state_valid" CHECK ("rate_approvals"."state" in ('pending', 'approved', 'rejected')),
	CONSTRAINT "rate_approvals_decided" CHECK (("rate_approvals"."state" = 'pending') = ("rate_approvals"."decided_by" is null)),
	CONSTRAINT "rate_approvals_points_positive" CHECK ("rate_approvals"."raise_points" > 0)
);
--> statement-breakpoint
CREATE TABLE "spot_prices" (
	"id" text PRIMARY KEY NOT NULL,
	"store_id" text NOT NULL,
	"metal" text NOT NULL,
	"price_per_troy_ounce" numeric(14, 4) NOT NULL,
	"currency" text NOT NULL,
	"entered_by" text NOT NULL,
	"entered_at" timestamp with time zone DEFAULT now() NOT NULL,
	"source" text DEFAULT 'manual' NOT NULL,
	CONSTRAINT "spot_prices_metal_valid" CHECK ("spot_prices"."metal" in ('gold', 'silver', 'platinum', 'palladium')),
	CONSTRAINT "spot_prices_positive" CHECK ("spot_prices"."price_per_troy_ounce" > 0),
	CONSTRAINT "spot_prices_currency_format" CHECK ("spot_prices"."currency" ~ '^[A-Z]{3}$')
);
--> statement-breakpoint
CREATE TABLE "ticket_counters" (
	"store_id" text PRIMARY KEY NOT NULL,
	"last_number" integer DEFAULT 0 NOT NULL
);
--> statement-breakpoint
CREATE TABLE "ticket_lines" (
	"id" text PRIMARY KEY NOT NULL,
	"ticket_id" text NOT NULL,
	"store_id" text NOT NULL,
	"position" integer NOT NULL,
	"input" jsonb NOT NULL,
	"description" text NOT NULL,
	"test_method" text DEFAULT 'none' NOT NULL,
	"test_result" text,
	"note" text,
	"raise_points" numeric(6, 2) DEFAULT '0' NOT NULL,
	"metal" text,
	"marked_fineness" numeric(10, 6),
	"paid_on_fineness" numeric(10, 6),
	"gross_weight_grams" numeric(14, 4),
	"net_weight_grams" numeric(14, 4),
	"fine_weight_grams" numeric(14, 4),
	"fine_weight_troy_ounces" numeric(14, 6),
	"spot_per_troy_ounce" numeric(14, 4),
	"rate_label" text,
	"melt_value_minor" bigint DEFAULT 0 NOT NULL,
	"payout_minor" bigint DEFAULT 0 NOT NULL,
	"margin_minor" bigint DEFAULT 0 NOT NULL,
	"pricing_problem" text,
	"tag_number" text,
	"hold_until" date,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "ticket_lines_test_method_valid" CHECK ("ticket_lines"."test_method" in ('none', 'acid', 'electronic', 'xrf', 'specific-gravity', 'magnet')),
	CONSTRAINT "ticket_lines_amounts_sane" CHECK ("ticket_lines"."melt_value_minor" >= 0 and "ticket_lines"."payout_minor" >= 0 and "ticket_lines"."margin_minor" = "ticket_lines"."melt_value_minor" - "ticket_lines"."payout_minor"),
	CONSTRAINT "ticket_lines_fineness_range" CHECK ("ticket_lines"."paid_on_fineness" is null or ("ticket_lines"."paid_on_fineness" > 0 and "ticket_lines"."paid_on_fineness" <= 1)),
	CONSTRAINT "ticket_lines_description_not_blank" CHECK (length(trim("ticket_lines"."description")) > 0)
);
--> statement-breakpoint
CREATE TABLE "tickets" (
	"id" text PRIMARY KEY NOT NULL,
	"store_id" text NOT NULL,
	"number" integer NOT NULL,
	"seller_id" text NOT NULL,
	"clerk_id" text NOT NULL,
	"state" text DEFAULT 'draft' NOT NULL,
	"currency" text NOT NULL,
	"ticket_raise_points" numeric(6, 2) DEFAULT '0' NOT NULL,
	"do_not_buy_override_by" text,
	"do_not_buy_override_reason" text,
	"pricing_basis" jsonb,
	"melt_value_minor" bigint DEFAULT 0 NOT NULL,
	"payout_minor" bigint DEFAULT 0 NOT NULL,
	"margin_minor" bigint DEFAULT 0 NOT NULL,
	"quoted_at" timestamp with time zone,
	"accepted_at" timestamp with time zone,
	"declined_at" timestamp with time zone,
	"paid_at" timestamp with time zone,
	"voided_at" timestamp with time zone,
	"voided_by" text,
	"void_reason" text,
	"signature_svg" text,
	"ownership_statement" text,
	"hold_until" date,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "tickets_state_valid" CHECK ("tickets"."state" in ('draft', 'quoted', 'accepted', 'declined', 'paid', 'voided')),
	CONSTRAINT "tickets_number_positive" CHECK ("tickets"."number" > 0),
	CONSTRAINT "tickets_amounts_sane" CHECK ("tickets"."melt_value_minor" >= 0 and "tickets"."payout_minor" >= 0 and "tickets"."margin_minor" = "tickets"."melt_value_minor" - "tickets"."payout_minor"),
	CONSTRAINT "tickets_accepted_has_signature" CHECK ("tickets"."accepted_at" is null or ("tickets"."signature_svg" is not null and "tickets"."ownership_statement" is not null and "tickets"."pricing_basis" is not null)),
	CONSTRAINT "tickets_state_times" CHECK (("tickets"."state" <> 'quoted' or "tickets"."quoted_at" is not null)
      and ("tickets"."state" <> 'accepted' or "tickets"."accepted_at" is not null)
      and ("tickets"."state" <> 'declined' or "tickets"."declined_at" is not null)
      and ("tickets"."state" <> 'paid' or ("tickets"."paid_at" is not null and "tickets"."accepted_at" is not null and "tickets"."hold_until" is not null))
      and ("tickets"."state" <> 'voided' or ("tickets"."voided_at" is not null and "tickets"."voided_by" is not null and "tickets"."void_reason" is not null))),
	CONSTRAINT "tickets_override_reason" CHECK ("tickets"."do_not_buy_override_by" is null or "tickets"."do_not_buy_override_reason" is not null)
);
--> statement-breakpoint
ALTER TABLE "cash_drawers" ADD CONSTRAINT "cash_drawers_store_id_stores_id_fk" FOREIGN KEY ("store_id") REFERENCES "public"."stores"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cash_drawers" ADD CONSTRAINT "cash_drawers_clerk_id_users_id_fk" FOREIGN KEY ("clerk_id") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cash_drawers" ADD CONSTRAINT "cash_drawers_closed_by_users_id_fk" FOREIGN KEY ("closed_by") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payments" ADD CONSTRAINT "payments_store_id_stores_id_fk" FOREIGN KEY ("store_id") REFERENCES "public"."stores"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payments" ADD CONSTRAINT "payments_ticket_id_tickets_id_fk" FOREIGN KEY ("ticket_id") REFERENCES "public"."tickets"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payments" ADD CONSTRAINT "payments_drawer_id_cash_drawers_id_fk" FOREIGN KEY ("drawer_id") REFERENCES "public"."cash_drawers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payments" ADD CONSTRAINT "payments_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_store_id_stores_id_fk" FOREIGN KEY ("store_id") REFERENCES "public"."stores"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_seller_id_sellers_id_fk" FOREIGN KEY ("seller_id") REFERENCES "public"."sellers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_ticket_id_tickets_id_fk" FOREIGN KEY ("ticket_id") REFERENCES "public"."tickets"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_line_id_ticket_lines_id_fk" FOREIGN KEY ("line_id") REFERENCES "public"."ticket_lines"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rate_approvals" ADD CONSTRAINT "rate_approvals_store_id_stores_id_fk" FOREIGN KEY ("store_id") REFERENCES "public"."stores"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rate_approvals" ADD CONSTRAINT "rate_approvals_ticket_id_tickets_id_fk" FOREIGN KEY ("ticket_id") REFERENCES "public"."tickets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rate_approvals" ADD CONSTRAINT "rate_approvals_line_id_ticket_lines_id_fk" FOREIGN KEY ("line_id") REFERENCES "public"."ticket_lines"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rate_approvals" ADD CONSTRAINT "rate_approvals_requested_by_users_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rate_approvals" ADD CONSTRAINT "rate_approvals_decided_by_users_id_fk" FOREIGN KEY ("decided_by") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "spot_prices" ADD CONSTRAINT "spot_prices_store_id_stores_id_fk" FOREIGN KEY ("store_id") REFERENCES "public"."stores"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "spot_prices" ADD CONSTRAINT "spot_prices_entered_by_users_id_fk" FOREIGN KEY ("entered_by") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ticket_counters" ADD CONSTRAINT "ticket_counters_store_id_stores_id_fk" FOREIGN KEY ("store_id") REFERENCES "public"."stores"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ticket_lines" ADD CONSTRAINT "ticket_lines_ticket_id_tickets_id_fk" FOREIGN KEY ("ticket_id") REFERENCES "public"."tickets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ticket_lines" ADD CONSTRAINT "ticket_lines_store_id_stores_id_fk" FOREIGN KEY ("store_id") REFERENCES "public"."stores"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tickets" ADD CONSTRAINT "tickets_store_id_stores_id_fk" FOREIGN KEY ("store_id") REFERENCES "public"."stores"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tickets" ADD CONSTRAINT "tickets_seller_id_sellers_id_fk" FOREIGN KEY ("seller_id") REFERENCES "public"."sellers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tickets" ADD CONSTRAINT "tickets_clerk_id_users_id_fk" FOREIGN KEY ("clerk_id") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tickets" ADD CONSTRAINT "tickets_do_not_buy_override_by_users_id_fk" FOREIGN KEY ("do_not_buy_override_by") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tickets" ADD CONSTRAINT "tickets_voided_by_users_id_fk" FOREIGN KEY ("voided_by") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "cash_drawers_one_open_per_clerk" ON "cash_drawers" USING btree ("clerk_id") WHERE "cash_drawers"."closed_at" is null;--> statement-breakpoint
CREATE UNIQUE INDEX "payments_one_live_payout_per_ticket" ON "payments" USING btree ("ticket_id") WHERE "payments"."kind" = 'payout' and "payments"."state" in ('pending', 'completed');--> statement-breakpoint
CREATE UNIQUE INDEX "payments_one_reversal_per_payment" ON "payments" USING btree ("reverses_payment_id");--> statement-breakpoint
CREATE INDEX "payments_drawer_idx" ON "payments" USING btree ("drawer_id");--> statement-breakpoint
CREATE UNIQUE INDEX "photos_object_key_unique" ON "photos" USING btree ("object_key");--> statement-breakpoint
CREATE INDEX "rate_approvals_store_state_idx" ON "rate_approvals" USING btree ("store_id","state");--> statement-breakpoint
CREATE INDEX "spot_prices_store_metal_at_idx" ON "spot_prices" USING btree ("store_id","metal","entered_at");--> statement-breakpoint
CREATE UNIQUE INDEX "ticket_lines_position_unique" ON "ticket_lines" USING btree ("ticket_id","position");--> statement-breakpoint
CREATE UNIQUE INDEX "ticket_lines_tag_unique" ON "ticket_lines" USING btree ("store_id","tag_number");--> statement-breakpoint
CREATE UNIQUE INDEX "tickets_store_number_unique" ON "tickets" USING btree ("store_id","number");--> statement-breakpoint
CREATE INDEX "tickets_seller_idx" ON "tickets" USING btree ("seller_id","created_at");--> statement-breakpoint
CREATE INDEX "tickets_store_state_idx" ON "tickets" USING btree ("store_id","state");