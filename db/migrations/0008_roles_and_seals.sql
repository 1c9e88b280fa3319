-- Database roles and tamper evidence (issue 14). Runs as the owner role (scripts/lib/migrate.ts uses
-- DATABASE_OWNER_URL). The app connects as benchclear_app, which gets only the grants it needs:
--   * audit_event, decision, application_revision: SELECT and INSERT only. No UPDATE, DELETE,
--     TRUNCATE, and no DDL (only a table's owner may ALTER it or disable its triggers).
--   * permit: SELECT, INSERT, and UPDATE of the columns that change after issue (state, revocation,
--     renewal link, rendered PDF, version, updated_at). What the permit says (number, holder,
--     revision, tier, validity, conditions, verification code, issue time) cannot be changed.
--   * every other table: SELECT, INSERT, UPDATE, DELETE (drafts, sessions, outbox and rate-limit
--     rows are working data). Default privileges give future tables the same.
-- The role is created here without LOGIN when missing (that needs CREATEROLE); the local scripts
-- give it a password and LOGIN, a deployment's DBA does the same.
DO $$
BEGIN
  IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'benchclear_app') THEN
    CREATE ROLE benchclear_app NOLOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOINHERIT;
  END IF;
END
$$;
--> statement-breakpoint
GRANT USAGE ON SCHEMA public TO benchclear_app;
--> statement-breakpoint
GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA public TO benchclear_app;
--> statement-breakpoint
GRANT USAGE, SELECT ON ALL SEQUENCES IN SCHEMA public TO benchclear_app;
--> statement-breakpoint
ALTER DEFAULT PRIVILEGES IN SCHEMA public GRANT SELECT, INSERT, UPDATE, DELETE ON TABLES TO benchclear_app;
--> statement-breakpoint
ALTER DEFAULT PRIVILEGES IN SCHEMA public GRANT USAGE, SELECT ON SEQUENCES TO benchclear_app;
--> statement-breakpoint
REVOKE UPDATE, DELETE, TRUNCATE, REFERENCES, TRIGGER ON audit_event, decision, application_revision, permit FROM benchclear_app;
--> statement-breakpoint
GRANT UPDATE (state, revoked_at, revoked_by_id, revoked_reason, renewed_by_application_id, pdf_key, pdf_rendered_state, version, updated_at) ON permit TO benchclear_app;
--> statement-breakpoint
-- The audit trail as a hash chain. Each row stores its place in the chain (chain_seq, 1, 2, …), the
-- hash of the row before (prev_hash) and its own hash: SHA-256 (hex) of prev_hash, a newline, and the
-- row's fields, each written as "<octet length>:<value>;" ("-;" for NULL), in the order chain_seq,
-- id, occurred_at (UTC, microseconds), actor_id, actor_name, action, entity_type, entity_id, data
-- (jsonb text). The first row's prev_hash is 64 zeros. lib/records/verify.ts recomputes it in
-- TypeScript. The chain head (one row) is updated by the insert trigger in the inserting transaction:
-- its row lock makes concurrent appends wait for each other, so the chain has no forks, and a rolled
-- back insert gives its place back.
ALTER TABLE audit_event ADD COLUMN chain_seq bigint;
--> statement-breakpoint
ALTER TABLE audit_event ADD COLUMN prev_hash text;
--> statement-breakpoint
ALTER TABLE audit_event ADD COLUMN hash text;
--> statement-breakpoint
CREATE TABLE audit_chain_head (
  id smallint PRIMARY KEY DEFAULT 1 CHECK (id = 1),
  seq bigint NOT NULL,
  hash text NOT NULL
);
--> statement-breakpoint
CREATE FUNCTION audit_event_field(value text) RETURNS text
LANGUAGE sql IMMUTABLE AS $$
  SELECT CASE WHEN value IS NULL THEN '-;' ELSE octet_length(value)::text || ':' || value || ';' END
$$;
--> statement-breakpoint
CREATE FUNCTION audit_event_row_hash(prev text, e audit_event) RETURNS text
LANGUAGE sql STABLE AS $$
  SELECT encode(sha256(convert_to(
    prev || E'\n'
      || audit_event_field(e.chain_seq::text)
      || audit_event_field(e.id::text)
      || audit_event_field(to_char(e.occurred_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"'))
      || audit_event_field(e.actor_id::text)
      || audit_event_field(e.actor_name)
      || audit_event_field(e.action)
      || audit_event_field(e.entity_type)
      || audit_event_field(e.entity_id)
      || audit_event_field(e.data::text),
    'UTF8')), 'hex')
$$;
--> statement-breakpoint
-- Rows written before this migration: chained here, in id order, as the owner. The chain vouches for
-- them from now on; what happened to them before cannot be proven (the verifier says where the
-- chain begins: the first row's time).
ALTER TABLE audit_event DISABLE TRIGGER audit_event_no_update_delete;
--> statement-breakpoint
DO $$
DECLARE
  r audit_event;
  prev text := repeat('0', 64);
  n bigint := 0;
BEGIN
  FOR r IN SELECT * FROM audit_event ORDER BY id LOOP
    n := n + 1;
    r.chain_seq := n;
    r.prev_hash := prev;
    r.hash := audit_event_row_hash(prev, r);
    UPDATE audit_event SET chain_seq = r.chain_seq, prev_hash = r.prev_hash, hash = r.hash WHERE id = r.id;
    prev := r.hash;
  END LOOP;
  INSERT INTO audit_chain_head (id, seq, hash) VALUES (1, n, prev);
END
$$;
--> statement-breakpoint
ALTER TABLE audit_event ENABLE TRIGGER audit_event_no_update_delete;
--> statement-breakpoint
ALTER TABLE audit_event ALTER COLUMN chain_seq SET NOT NULL;
--> statement-breakpoint
ALTER TABLE audit_event ALTER COLUMN prev_hash SET NOT NULL;
--> statement-breakpoint
ALTER TABLE audit_event ALTER COLUMN hash SET NOT NULL;
--> statement-breakpoint
ALTER TABLE audit_event ADD CONSTRAINT audit_event_chain_seq_key UNIQUE (chain_seq);
--> statement-breakpoint
-- SECURITY DEFINER: the trigger runs as the owner, so it may move the chain head, which the app's
-- role can only read. Whatever the inserting statement put in the chain columns is overwritten.
CREATE FUNCTION audit_event_chain() RETURNS trigger
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
DECLARE
  head audit_chain_head;
BEGIN
  SELECT * INTO head FROM audit_chain_head WHERE id = 1 FOR UPDATE;
  NEW.chain_seq := head.seq + 1;
  NEW.prev_hash := head.hash;
  NEW.hash := audit_event_row_hash(head.hash, NEW);
  UPDATE audit_chain_head SET seq = NEW.chain_seq, hash = NEW.hash WHERE id = 1;
  RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER audit_event_chain BEFORE INSERT ON audit_event FOR EACH ROW EXECUTE FUNCTION audit_event_chain();
--> statement-breakpoint
REVOKE ALL ON audit_chain_head FROM benchclear_app;
--> statement-breakpoint
GRANT SELECT ON audit_chain_head TO benchclear_app;
--> statement-breakpoint
-- Decisions carry an HMAC-SHA-256 (key DECISION_HMAC_KEY, from the environment, never stored here)
-- over what was decided, the validity an approval granted included (valid_from, valid_to and
-- validity_reason, migration 0006): see lib/records/seal.ts. Decisions made before this migration are
-- sealed by scripts/lib/migrate.ts (it has the key), which then makes hmac NOT NULL, so no unsealed row can be
-- added later.
ALTER TABLE decision ADD COLUMN hmac text;
--> statement-breakpoint
-- Approvals made before migration 0006 recorded their validity on the permit only: copy it to the
-- approval, so the seal covers it.
UPDATE decision d SET valid_from = p.valid_from, valid_to = p.valid_to, validity_reason = p.validity_reason
  FROM permit p WHERE d.kind = 'approve' AND d.valid_from IS NULL AND p.revision_id = d.revision_id;
--> statement-breakpoint
-- The insert trigger fills these; the defaults only let an INSERT leave them out.
ALTER TABLE audit_event ALTER COLUMN chain_seq SET DEFAULT 0;
--> statement-breakpoint
ALTER TABLE audit_event ALTER COLUMN prev_hash SET DEFAULT '';
--> statement-breakpoint
ALTER TABLE audit_event ALTER COLUMN hash SET DEFAULT '';
