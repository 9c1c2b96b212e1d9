-- Tamper-evident audit trail (21 CFR Part 11 §11.10(e)): every row carries the hash of the
-- previous row, and its own hash is SHA-256 over its canonical text and that previous hash.
-- Rows are sealed at commit (a deferred constraint trigger) under one advisory lock, so the
-- chain is linear: a later transaction waits and links to the row sealed before it. The lock
-- is taken last in each transaction, after every row lock it needs, so it cannot deadlock.

-- The canonical text of a row: a JSON array of its fields in a fixed order, times in UTC with
-- microseconds; jsonb's text form is deterministic (keys ordered, no spacing choices).
CREATE OR REPLACE FUNCTION audit_log_canonical(r audit_log, prev text) RETURNS text LANGUAGE sql STABLE AS $$
  SELECT jsonb_build_array(
    r.id,
    to_char(r.at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"'),
    r.actor_id,
    r.action,
    r.entity_type,
    r.entity_id,
    r.before,
    r.after,
    r.reason,
    prev
  )::text
$$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION audit_log_hash(r audit_log, prev text) RETURNS text LANGUAGE sql STABLE AS $$
  SELECT encode(sha256(convert_to(audit_log_canonical(r, prev), 'UTF8')), 'hex')
$$;
--> statement-breakpoint
CREATE SEQUENCE IF NOT EXISTS audit_log_chain_seq_seq;
--> statement-breakpoint
-- Append-only, except the one-time sealing of a row's chain fields by audit_log_seal().
CREATE OR REPLACE FUNCTION audit_log_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'UPDATE'
     AND current_setting('tacklog.audit_sealing', true) = 'on'
     AND OLD.hash IS NULL
     AND (OLD.id, OLD.at, OLD.actor_id, OLD.action, OLD.entity_type, OLD.entity_id, OLD.before, OLD.after, OLD.reason)
         IS NOT DISTINCT FROM
         (NEW.id, NEW.at, NEW.actor_id, NEW.action, NEW.entity_type, NEW.entity_id, NEW.before, NEW.after, NEW.reason)
  THEN
    RETURN NEW;
  END IF;
  RAISE EXCEPTION 'audit_log is append-only: % is not allowed', TG_OP USING ERRCODE = 'insufficient_privilege';
END;
$$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION audit_log_seal() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  r audit_log;
  last_hash text;
BEGIN
  PERFORM pg_advisory_xact_lock(7226003);
  SELECT * INTO r FROM audit_log WHERE id = NEW.id;
  IF NOT FOUND OR r.hash IS NOT NULL THEN
    RETURN NULL;
  END IF;
  SELECT hash INTO last_hash FROM audit_log WHERE chain_seq IS NOT NULL ORDER BY chain_seq DESC LIMIT 1;
  PERFORM set_config('tacklog.audit_sealing', 'on', true);
  UPDATE audit_log
     SET chain_seq = nextval('audit_log_chain_seq_seq'), prev_hash = last_hash, hash = audit_log_hash(r, last_hash)
   WHERE id = NEW.id;
  PERFORM set_config('tacklog.audit_sealing', 'off', true);
  RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE CONSTRAINT TRIGGER audit_log_seal AFTER INSERT ON audit_log
  DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION audit_log_seal();
--> statement-breakpoint
-- Chain the rows written before this migration, in the order they were written.
DO $$
DECLARE
  r audit_log;
  last_hash text := NULL;
BEGIN
  PERFORM pg_advisory_xact_lock(7226003);
  PERFORM set_config('tacklog.audit_sealing', 'on', true);
  FOR r IN SELECT * FROM audit_log WHERE hash IS NULL ORDER BY id LOOP
    UPDATE audit_log
       SET chain_seq = nextval('audit_log_chain_seq_seq'), prev_hash = last_hash, hash = audit_log_hash(r, last_hash)
     WHERE id = r.id;
    last_hash := audit_log_hash(r, last_hash);
  END LOOP;
  PERFORM set_config('tacklog.audit_sealing', 'off', true);
END;
$$;
