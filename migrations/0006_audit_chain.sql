CREATE TABLE "audit_chain" (
	"position" bigint PRIMARY KEY NOT NULL,
	"audit_id" bigint NOT NULL,
	"prev_hash" text NOT NULL,
	"hash" text NOT NULL,
	CONSTRAINT "audit_chain_position_positive" CHECK ("audit_chain"."position" > 0),
	CONSTRAINT "audit_chain_hash_format" CHECK ("audit_chain"."hash" ~ '^[0-9a-f]{64}$' and "audit_chain"."prev_hash" ~ '^[0-9a-f]{64}$')
);
--> statement-breakpoint
ALTER TABLE "audit_log" ADD COLUMN "tx_id" bigint DEFAULT txid_current() NOT NULL;--> statement-breakpoint
ALTER TABLE "audit_chain" ADD CONSTRAINT "audit_chain_audit_id_audit_log_id_fk" FOREIGN KEY ("audit_id") REFERENCES "public"."audit_log"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "audit_chain_audit_unique" ON "audit_chain" USING btree ("audit_id");--> statement-breakpoint
CREATE INDEX "audit_log_tx_idx" ON "audit_log" USING btree ("tx_id");