CREATE TABLE "accounts" (
	"user_id" text NOT NULL,
	"type" text NOT NULL,
	"provider" text NOT NULL,
	"provider_account_id" text NOT NULL,
	"refresh_token" text,
	"access_token" text,
	"expires_at" integer,
	"token_type" text,
	"scope" text,
	"id_token" text,
	"session_state" text,
	CONSTRAINT "accounts_provider_provider_account_id_pk" PRIMARY KEY("provider","provider_account_id")
);
--> statement-breakpoint
CREATE TABLE "audit_log" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"store_id" text,
	"actor_user_id" text,
	"action" text NOT NULL,
	"entity" text NOT NULL,
	"entity_id" text NOT NULL,
	"before" jsonb,
	"after" jsonb,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "audit_log_action_format" CHECK ("audit_log"."action" ~ '^[a-z][a-z0-9_.-]*$')
);
--> statement-breakpoint
CREATE TABLE "sellers" (
	"id" text PRIMARY KEY NOT NULL,
	"store_id" text NOT NULL,
	"legal_name" text NOT NULL,
	"email" text,
	"phone" text,
	"id_type" text NOT NULL,
	"id_number" text NOT NULL,
	"id_issuing_region" text NOT NULL,
	"id_expiry" date NOT NULL,
	"date_of_birth" date NOT NULL,
	"address_line1" text NOT NULL,
	"address_line2" text,
	"city" text NOT NULL,
	"region" text NOT NULL,
	"postal_code" text NOT NULL,
	"country" text NOT NULL,
	"do_not_buy" boolean DEFAULT false NOT NULL,
	"do_not_buy_reason" text,
	"user_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "sellers_legal_name_not_blank" CHECK (length(trim("sellers"."legal_name")) > 0),
	CONSTRAINT "sellers_id_number_not_blank" CHECK (length(trim("sellers"."id_number")) > 0),
	CONSTRAINT "sellers_id_type_valid" CHECK ("sellers"."id_type" in ('drivers-license', 'state-id', 'passport', 'national-id', 'residence-permit', 'military-id')),
	CONSTRAINT "sellers_birth_plausible" CHECK ("sellers"."date_of_birth" > '1900-01-01'),
	CONSTRAINT "sellers_country_format" CHECK ("sellers"."country" ~ '^[A-Z]{2}$'),
	CONSTRAINT "sellers_do_not_buy_reason" CHECK (not "sellers"."do_not_buy" or "sellers"."do_not_buy_reason" is not null),
	CONSTRAINT "sellers_contact_present" CHECK ("sellers"."email" is not null or "sellers"."phone" is not null)
);
--> statement-breakpoint
CREATE TABLE "sessions" (
	"session_token" text PRIMARY KEY NOT NULL,
	"user_id" text NOT NULL,
	"expires" timestamp with time zone NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sign_in_failures" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"email_key" text NOT NULL,
	"client_address" text NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "store_settings" (
	"store_id" text NOT NULL,
	"key" text NOT NULL,
	"value_type" text NOT NULL,
	"value" jsonb NOT NULL,
	"updated_by" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "store_settings_store_id_key_pk" PRIMARY KEY("store_id","key"),
	CONSTRAINT "store_settings_key_format" CHECK ("store_settings"."key" ~ '^[a-z][a-z0-9_.]{1,63}$'),
	CONSTRAINT "store_settings_type_valid" CHECK ("store_settings"."value_type" in ('integer', 'decimal', 'boolean', 'string', 'json')),
	CONSTRAINT "store_settings_value_matches_type" CHECK (case "store_settings"."value_type"
        when 'integer' then jsonb_typeof("store_settings"."value") = 'number' and ("store_settings"."value"::text)::numeric % 1 = 0
        when 'decimal' then jsonb_typeof("store_settings"."value") = 'string' and ("store_settings"."value" #>> '{}') ~ '^-?[0-9]+(\.[0-9]+)?$'
        when 'boolean' then jsonb_typeof("store_settings"."value") = 'boolean'
        when 'string' then jsonb_typeof("store_settings"."value") = 'string'
        else true end)
);
--> statement-breakpoint
CREATE TABLE "stores" (
	"id" text PRIMARY KEY NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"chain_name" text NOT NULL,
	"address_line1" text NOT NULL,
	"address_line2" text,
	"city" text NOT NULL,
	"region" text NOT NULL,
	"postal_code" text NOT NULL,
	"country" text NOT NULL,
	"phone" text,
	"currency" text DEFAULT 'USD' NOT NULL,
	"time_zone" text DEFAULT 'America/New_York' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "stores_code_format" CHECK ("stores"."code" ~ '^[A-Z0-9]{2,12}$'),
	CONSTRAINT "stores_currency_format" CHECK ("stores"."currency" ~ '^[A-Z]{3}$'),
	CONSTRAINT "stores_country_format" CHECK ("stores"."country" ~ '^[A-Z]{2}$'),
	CONSTRAINT "stores_name_not_blank" CHECK (length(trim("stores"."name")) > 0)
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" text PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"email" text NOT NULL,
	"email_verified" timestamp with time zone,
	"image" text,
	"password_hash" text,
	"role" text NOT NULL,
	"store_id" text,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "users_role_valid" CHECK ("users"."role" in ('admin', 'manager', 'clerk', 'seller')),
	CONSTRAINT "users_email_format" CHECK ("users"."email" ~ '^[^@\s]+@[^@\s]+\.[^@\s]+$'),
	CONSTRAINT "users_store_required" CHECK ("users"."role" = 'admin' or "users"."store_id" is not null),
	CONSTRAINT "users_password_is_bcrypt" CHECK ("users"."password_hash" is null or "users"."password_hash" ~ '^\$2[aby]\$[0-9]{2}\$.{53}$'),
	CONSTRAINT "users_staff_have_password" CHECK ("users"."role" = 'seller' or "users"."password_hash" is not null)
);
--> statement-breakpoint
CREATE TABLE "verification_tokens" (
	"identifier" text NOT NULL,
	"token" text NOT NULL,
	"expires" timestamp with time zone NOT NULL,
	CONSTRAINT "verification_tokens_identifier_token_pk" PRIMARY KEY("identifier","token")
);
--> statement-breakpoint
ALTER TABLE "accounts" ADD CONSTRAINT "accounts_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_log" ADD CONSTRAINT "audit_log_store_id_stores_id_fk" FOREIGN KEY ("store_id") REFERENCES "public"."stores"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_log" ADD CONSTRAINT "audit_log_actor_user_id_users_id_fk" FOREIGN KEY ("actor_user_id") REFERENCES "public"."users"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sellers" ADD CONSTRAINT "sellers_store_id_stores_id_fk" FOREIGN KEY ("store_id") REFERENCES "public"."stores"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sellers" ADD CONSTRAINT "sellers_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sessions" ADD CONSTRAINT "sessions_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "store_settings" ADD CONSTRAINT "store_settings_store_id_stores_id_fk" FOREIGN KEY ("store_id") REFERENCES "public"."stores"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "store_settings" ADD CONSTRAINT "store_settings_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "users" ADD CONSTRAINT "users_store_id_stores_id_fk" FOREIGN KEY ("store_id") REFERENCES "public"."stores"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "audit_log_entity_idx" ON "audit_log" USING btree ("entity","entity_id");--> statement-breakpoint
CREATE INDEX "audit_log_store_at_idx" ON "audit_log" USING btree ("store_id","at");--> statement-breakpoint
CREATE UNIQUE INDEX "sellers_id_document_unique" ON "sellers" USING btree ("store_id","id_type","id_issuing_region","id_number");--> statement-breakpoint
CREATE UNIQUE INDEX "sellers_user_unique" ON "sellers" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "sellers_store_name_idx" ON "sellers" USING btree ("store_id","legal_name");--> statement-breakpoint
CREATE INDEX "sign_in_failures_email_idx" ON "sign_in_failures" USING btree ("email_key","at");--> statement-breakpoint
CREATE INDEX "sign_in_failures_address_idx" ON "sign_in_failures" USING btree ("client_address","at");--> statement-breakpoint
CREATE UNIQUE INDEX "stores_code_unique" ON "stores" USING btree ("code");--> statement-breakpoint
CREATE UNIQUE INDEX "users_email_unique" ON "users" USING btree (lower("email"));--> statement-breakpoint
CREATE INDEX "users_store_idx" ON "users" USING btree ("store_id");