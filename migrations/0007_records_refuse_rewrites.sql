-- Records on file refuse rewrites.
--
-- A ticket the seller has accepted (signed), paid or voided is on the record: its purchase figures,
-- its lines, its payments and its photos stay as they were. The only changes let through are the
-- ones the counter makes (paying, voiding, tags and release dates given at payment, a payment's
-- outcome from the provider), and each of those commits only together with an audit row written in
-- the same transaction. The audit log itself becomes a hash chain, written by the database.
--
-- These rules bind every role, the owner included; the application's role additionally owns no
-- table (so it cannot DISABLE TRIGGER) and is not a superuser (so it cannot set
-- session_replication_role). Errors: 23R01 a record on file refused a change; 23R02 a permitted
-- change came without its audit row.

-- The columns of old_row that new_row changes, less those allowed to change.
CREATE FUNCTION record_changed_columns(old_row jsonb, new_row jsonb, allowed text[]) RETURNS text[]
LANGUAGE sql IMMUTABLE AS $$
  SELECT coalesce(array_agg(key ORDER BY key), '{}')
  FROM (
    SELECT n.key FROM jsonb_each(new_row) n WHERE n.value IS DISTINCT FROM old_row -> n.key
    UNION
    SELECT o.key FROM jsonb_each(old_row) o WHERE NOT new_row ? o.key
  ) changed
  WHERE key <> ALL (allowed)
$$;
--> statement-breakpoint
CREATE FUNCTION ticket_on_record(p_ticket_id text) RETURNS boolean
LANGUAGE sql STABLE AS $$
  SELECT EXISTS (SELECT 1 FROM tickets WHERE id = p_ticket_id AND state IN ('accepted', 'paid', 'voided'))
$$;
--> statement-breakpoint
-- Tickets: on record, only the state moves (accepted -> paid or voided, paid -> voided), the payment
-- time and release date are set when it is paid, the void details when it is voided. Nothing else.
-- A new ticket column is frozen on record unless it is added to the list below.
CREATE FUNCTION tickets_keep_record() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
  changed text[];
BEGIN
  IF OLD.state NOT IN ('accepted', 'paid', 'voided') THEN
    IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
    RETURN NEW;
  END IF;
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION 'Ticket % (number %) is %: it is on the record and cannot be deleted', OLD.id, OLD.number, OLD.state
      USING ERRCODE = '23R01', CONSTRAINT = 'tickets_on_record', TABLE = 'tickets';
  END IF;
  changed := record_changed_columns(to_jsonb(OLD), to_jsonb(NEW),
    ARRAY['state', 'paid_at', 'hold_until', 'voided_at', 'voided_by', 'void_reason', 'updated_at']);
  IF cardinality(changed) > 0 THEN
    RAISE EXCEPTION 'Ticket % (number %) is %: % cannot be changed on a ticket on the record', OLD.id, OLD.number, OLD.state, array_to_string(changed, ', ')
      USING ERRCODE = '23R01', CONSTRAINT = 'tickets_on_record', TABLE = 'tickets';
  END IF;
  IF NEW.state IS DISTINCT FROM OLD.state
     AND NOT ((OLD.state = 'accepted' AND NEW.state IN ('paid', 'voided')) OR (OLD.state = 'paid' AND NEW.state = 'voided')) THEN
    RAISE EXCEPTION 'Ticket % (number %) is %: it cannot become %', OLD.id, OLD.number, OLD.state, NEW.state
      USING ERRCODE = '23R01', CONSTRAINT = 'tickets_on_record', TABLE = 'tickets';
  END IF;
  IF (NEW.paid_at, NEW.hold_until) IS DISTINCT FROM (OLD.paid_at, OLD.hold_until)
     AND NOT (OLD.state = 'accepted' AND NEW.state = 'paid') THEN
    RAISE EXCEPTION 'Ticket % (number %): the payment time and release date are set when it is paid, and kept', OLD.id, OLD.number
      USING ERRCODE = '23R01', CONSTRAINT = 'tickets_on_record', TABLE = 'tickets';
  END IF;
  IF (NEW.voided_at, NEW.voided_by, NEW.void_reason) IS DISTINCT FROM (OLD.voided_at, OLD.voided_by, OLD.void_reason)
     AND NOT (OLD.state <> 'voided' AND NEW.state = 'voided') THEN
    RAISE EXCEPTION 'Ticket % (number %): the void details are set when it is voided, and kept', OLD.id, OLD.number
      USING ERRCODE = '23R01', CONSTRAINT = 'tickets_on_record', TABLE = 'tickets';
  END IF;
  RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER tickets_keep_record BEFORE UPDATE OR DELETE ON tickets FOR EACH ROW EXECUTE FUNCTION tickets_keep_record();
--> statement-breakpoint
-- Lines of a ticket on record: none added, none removed, nothing changed but the tag and release
-- date, which are given once, while the ticket is accepted and being paid.
CREATE FUNCTION ticket_lines_keep_record() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
  changed text[];
  ticket_state text;
BEGIN
  IF TG_OP = 'INSERT' THEN
    IF ticket_on_record(NEW.ticket_id) THEN
      RAISE EXCEPTION 'Ticket % is on the record: no line can be added to it', NEW.ticket_id
        USING ERRCODE = '23R01', CONSTRAINT = 'ticket_lines_on_record', TABLE = 'ticket_lines';
    END IF;
    RETURN NEW;
  END IF;
  IF TG_OP = 'DELETE' THEN
    IF ticket_on_record(OLD.ticket_id) THEN
      RAISE EXCEPTION 'Line % of ticket % is on the record and cannot be removed', OLD.position, OLD.ticket_id
        USING ERRCODE = '23R01', CONSTRAINT = 'ticket_lines_on_record', TABLE = 'ticket_lines';
    END IF;
    RETURN OLD;
  END IF;
  IF NEW.ticket_id IS DISTINCT FROM OLD.ticket_id AND ticket_on_record(NEW.ticket_id) THEN
    RAISE EXCEPTION 'Ticket % is on the record: no line can be moved onto it', NEW.ticket_id
      USING ERRCODE = '23R01', CONSTRAINT = 'ticket_lines_on_record', TABLE = 'ticket_lines';
  END IF;
  SELECT state INTO ticket_state FROM tickets WHERE id = OLD.ticket_id;
  IF ticket_state IS NULL OR ticket_state NOT IN ('accepted', 'paid', 'voided') THEN
    RETURN NEW;
  END IF;
  changed := record_changed_columns(to_jsonb(OLD), to_jsonb(NEW), ARRAY['tag_number', 'hold_until', 'updated_at']);
  IF cardinality(changed) > 0 THEN
    RAISE EXCEPTION 'Line % of ticket % is on the record (the ticket is %): % cannot be changed', OLD.position, OLD.ticket_id, ticket_state, array_to_string(changed, ', ')
      USING ERRCODE = '23R01', CONSTRAINT = 'ticket_lines_on_record', TABLE = 'ticket_lines';
  END IF;
  IF (NEW.tag_number, NEW.hold_until) IS DISTINCT FROM (OLD.tag_number, OLD.hold_until)
     AND NOT (ticket_state = 'accepted' AND OLD.tag_number IS NULL AND OLD.hold_until IS NULL) THEN
    RAISE EXCEPTION 'Line % of ticket %: its tag and release date are given once, when the ticket is paid', OLD.position, OLD.ticket_id
      USING ERRCODE = '23R01', CONSTRAINT = 'ticket_lines_on_record', TABLE = 'ticket_lines';
  END IF;
  RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER ticket_lines_keep_record BEFORE INSERT OR UPDATE OR DELETE ON ticket_lines FOR EACH ROW EXECUTE FUNCTION ticket_lines_keep_record();
--> statement-breakpoint
-- Payments are never deleted. What was paid, how, to whom and from which drawer never changes; the
-- provider's transfer and payout ids are recorded once; completed and failed are final.
CREATE FUNCTION payments_keep_record() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
  frozen text[];
BEGIN
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION 'Payment % of ticket % is on the record: payments are never deleted', OLD.id, OLD.ticket_id
      USING ERRCODE = '23R01', CONSTRAINT = 'payments_on_record', TABLE = 'payments';
  END IF;
  SELECT coalesce(array_agg(c ORDER BY c), '{}') INTO frozen
  FROM unnest(record_changed_columns(to_jsonb(OLD), to_jsonb(NEW), '{}')) c
  WHERE c IN ('id', 'store_id', 'ticket_id', 'kind', 'reverses_payment_id', 'method', 'amount_minor', 'currency',
              'drawer_id', 'check_number', 'provider_account_id', 'payout_speed', 'created_by', 'created_at');
  IF cardinality(frozen) > 0 THEN
    RAISE EXCEPTION 'Payment % of ticket % is on the record: % cannot be changed', OLD.id, OLD.ticket_id, array_to_string(frozen, ', ')
      USING ERRCODE = '23R01', CONSTRAINT = 'payments_on_record', TABLE = 'payments';
  END IF;
  IF (OLD.provider_transfer_id IS NOT NULL AND NEW.provider_transfer_id IS DISTINCT FROM OLD.provider_transfer_id)
     OR (OLD.provider_payout_id IS NOT NULL AND NEW.provider_payout_id IS DISTINCT FROM OLD.provider_payout_id) THEN
    RAISE EXCEPTION 'Payment % of ticket %: the provider''s transfer and payout are recorded once', OLD.id, OLD.ticket_id
      USING ERRCODE = '23R01', CONSTRAINT = 'payments_on_record', TABLE = 'payments';
  END IF;
  IF OLD.state IN ('completed', 'failed') AND (NEW.state, NEW.failure_reason) IS DISTINCT FROM (OLD.state, OLD.failure_reason) THEN
    RAISE EXCEPTION 'Payment % of ticket % is %: its outcome is final', OLD.id, OLD.ticket_id, OLD.state
      USING ERRCODE = '23R01', CONSTRAINT = 'payments_on_record', TABLE = 'payments';
  END IF;
  RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER payments_keep_record BEFORE UPDATE OR DELETE ON payments FOR EACH ROW EXECUTE FUNCTION payments_keep_record();
--> statement-breakpoint
-- Photos of a ticket on record are neither changed nor removed (new ones may still be added).
CREATE FUNCTION photos_keep_record() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
  changed text[];
BEGIN
  IF TG_OP = 'DELETE' THEN
    IF OLD.ticket_id IS NOT NULL AND ticket_on_record(OLD.ticket_id) THEN
      RAISE EXCEPTION 'Photo % of ticket % is on the record and cannot be removed', OLD.id, OLD.ticket_id
        USING ERRCODE = '23R01', CONSTRAINT = 'photos_on_record', TABLE = 'photos';
    END IF;
    RETURN OLD;
  END IF;
  IF (OLD.ticket_id IS NOT NULL AND ticket_on_record(OLD.ticket_id))
     OR (NEW.ticket_id IS DISTINCT FROM OLD.ticket_id AND NEW.ticket_id IS NOT NULL AND ticket_on_record(NEW.ticket_id)) THEN
    changed := record_changed_columns(to_jsonb(OLD), to_jsonb(NEW), '{}');
    IF cardinality(changed) > 0 THEN
      RAISE EXCEPTION 'Photo % of ticket % is on the record: % cannot be changed', OLD.id, coalesce(OLD.ticket_id, NEW.ticket_id), array_to_string(changed, ', ')
        USING ERRCODE = '23R01', CONSTRAINT = 'photos_on_record', TABLE = 'photos';
    END IF;
  END IF;
  RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER photos_keep_record BEFORE UPDATE OR DELETE ON photos FOR EACH ROW EXECUTE FUNCTION photos_keep_record();
--> statement-breakpoint
-- A permitted change to a record on file commits only with an audit row of the same transaction
-- about that ticket (or that row). Checked at commit, so the order of the two does not matter.
CREATE FUNCTION require_audit_of_change() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
  subject text[];
BEGIN
  IF TG_TABLE_NAME = 'tickets' THEN
    subject := ARRAY[NEW.id];
  ELSE
    IF TG_TABLE_NAME = 'ticket_lines' AND NOT ticket_on_record(NEW.ticket_id) THEN
      RETURN NULL;
    END IF;
    subject := ARRAY[NEW.ticket_id, NEW.id];
  END IF;
  IF NOT EXISTS (SELECT 1 FROM audit_log WHERE tx_id = txid_current() AND entity_id = ANY (subject)) THEN
    RAISE EXCEPTION 'The change to % % is not in the audit log: a change to a record on file must be audited in the same transaction', TG_TABLE_NAME, NEW.id
      USING ERRCODE = '23R02', CONSTRAINT = TG_TABLE_NAME || '_change_audited', TABLE = TG_TABLE_NAME;
  END IF;
  RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE CONSTRAINT TRIGGER tickets_change_audited AFTER UPDATE ON tickets DEFERRABLE INITIALLY DEFERRED FOR EACH ROW
  WHEN (OLD.state IN ('accepted', 'paid', 'voided')
        AND (OLD.state, OLD.paid_at, OLD.hold_until, OLD.voided_at, OLD.voided_by, OLD.void_reason)
            IS DISTINCT FROM (NEW.state, NEW.paid_at, NEW.hold_until, NEW.voided_at, NEW.voided_by, NEW.void_reason))
  EXECUTE FUNCTION require_audit_of_change();
--> statement-breakpoint
CREATE CONSTRAINT TRIGGER ticket_lines_change_audited AFTER UPDATE ON ticket_lines DEFERRABLE INITIALLY DEFERRED FOR EACH ROW
  WHEN ((OLD.tag_number, OLD.hold_until) IS DISTINCT FROM (NEW.tag_number, NEW.hold_until))
  EXECUTE FUNCTION require_audit_of_change();
--> statement-breakpoint
CREATE CONSTRAINT TRIGGER payments_change_audited AFTER UPDATE ON payments DEFERRABLE INITIALLY DEFERRED FOR EACH ROW
  WHEN ((OLD.state, OLD.failure_reason, OLD.provider_transfer_id, OLD.provider_payout_id)
        IS DISTINCT FROM (NEW.state, NEW.failure_reason, NEW.provider_transfer_id, NEW.provider_payout_id))
  EXECUTE FUNCTION require_audit_of_change();
--> statement-breakpoint
-- ---------------------------------------------------------------------------
-- The audit chain
-- ---------------------------------------------------------------------------
CREATE OR REPLACE FUNCTION audit_log_refuse_change() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION '% is append-only: % refused', TG_TABLE_NAME, TG_OP USING ERRCODE = 'insufficient_privilege';
END;
$$;
--> statement-breakpoint
-- What an entry's hash covers: every column of the audit row, in a fixed text form (jsonb's text
-- output is canonical; the time is written in UTC to the microsecond).
CREATE FUNCTION audit_chain_input(entry audit_log) RETURNS text
LANGUAGE sql STABLE AS $$
  SELECT jsonb_build_array(entry.id, entry.store_id, entry.actor_user_id, entry.action, entry.entity, entry.entity_id,
    entry.before, entry.after, to_char(entry.at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"'), entry.tx_id)::text
$$;
--> statement-breakpoint
CREATE FUNCTION audit_chain_digest(prev_hash text, chain_position bigint, entry audit_log) RETURNS text
LANGUAGE sql STABLE AS $$
  SELECT encode(sha256(convert_to(prev_hash || '|' || chain_position::text || '|' || audit_chain_input(entry), 'UTF8')), 'hex')
$$;
--> statement-breakpoint
-- The rows written before the chain existed, in the order of their ids.
DO $$
DECLARE
  entry audit_log;
  pos bigint := 0;
  prev text := repeat('0', 64);
  digest text;
BEGIN
  FOR entry IN SELECT * FROM audit_log ORDER BY id LOOP
    pos := pos + 1;
    digest := audit_chain_digest(prev, pos, entry);
    INSERT INTO audit_chain (position, audit_id, prev_hash, hash) VALUES (pos, entry.id, prev, digest);
    prev := digest;
  END LOOP;
END;
$$;
--> statement-breakpoint
-- Runs at commit, as the owner (the application's role cannot write the chain): one committing
-- transaction at a time takes the next positions, so the chain follows commit order and a backup's
-- snapshot always holds a whole prefix of it. The lock is held only for the moment of the commit.
CREATE FUNCTION audit_chain_append() RETURNS trigger
LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, public AS $$
DECLARE
  head_position bigint;
  head_hash text;
  next_position bigint;
  prev text;
BEGIN
  PERFORM pg_advisory_xact_lock(7261005114803343);
  SELECT c.position, c.hash INTO head_position, head_hash FROM audit_chain c ORDER BY c.position DESC LIMIT 1;
  next_position := coalesce(head_position, 0) + 1;
  prev := coalesce(head_hash, repeat('0', 64));
  INSERT INTO audit_chain (position, audit_id, prev_hash, hash) VALUES (next_position, NEW.id, prev, audit_chain_digest(prev, next_position, NEW));
  RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE CONSTRAINT TRIGGER audit_log_chain AFTER INSERT ON audit_log DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION audit_chain_append();
--> statement-breakpoint
CREATE TRIGGER audit_chain_no_update BEFORE UPDATE OR DELETE ON audit_chain FOR EACH ROW EXECUTE FUNCTION audit_log_refuse_change();
--> statement-breakpoint
CREATE TRIGGER audit_chain_no_truncate BEFORE TRUNCATE ON audit_chain FOR EACH STATEMENT EXECUTE FUNCTION audit_log_refuse_change();
--> statement-breakpoint
-- Every entry that does not verify, and every audit row missing from the chain; no rows: intact.
CREATE FUNCTION audit_chain_breaks() RETURNS TABLE (chain_position bigint, audit_id bigint, problem text)
LANGUAGE sql STABLE AS $$
  WITH c AS (
    SELECT c.position, c.audit_id, c.prev_hash, c.hash,
           lag(c.position) OVER w AS before_position, lag(c.hash) OVER w AS before_hash, a AS entry
    FROM audit_chain c LEFT JOIN audit_log a ON a.id = c.audit_id
    WINDOW w AS (ORDER BY c.position)
  ), checked AS (
    SELECT position, audit_id, CASE
      WHEN (entry).id IS NULL THEN 'its audit row is missing'
      WHEN position <> coalesce(before_position, 0) + 1 THEN 'positions are missing before it'
      WHEN prev_hash <> coalesce(before_hash, repeat('0', 64)) THEN 'it does not follow the entry before it'
      WHEN hash <> audit_chain_digest(prev_hash, position, entry) THEN 'its audit row or its hash was changed'
    END AS problem
    FROM c
  )
  SELECT position, audit_id, problem FROM checked WHERE problem IS NOT NULL
  UNION ALL
  SELECT NULL, a.id, 'the audit row is not in the chain' FROM audit_log a
  WHERE NOT EXISTS (SELECT 1 FROM audit_chain c WHERE c.audit_id = a.id)
  ORDER BY 1 NULLS LAST, 2
$$;
