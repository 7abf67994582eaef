-- The runtime role and "closed means closed" (docs/decisions/011-database-roles-and-evidence-triggers.md).
-- Self-contained: it only refers to tables of 0000–0003 and may run after other branches' migrations.

-- connect-pg-simple's session table, created here because the runtime role may not create tables.
CREATE TABLE IF NOT EXISTS "session" (
  "sid" varchar NOT NULL COLLATE "default" PRIMARY KEY,
  "sess" json NOT NULL,
  "expire" timestamp(6) NOT NULL
);
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "IDX_session_expire" ON "session" ("expire");
--> statement-breakpoint
-- The runtime group may read and write rows, nothing more; tables the owner creates later are granted
-- as they are created. (Skipped where the roles were not provisioned; scripts/ always provision first.)
DO $$
BEGIN
  IF EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'tenthwise_runtime') THEN
    GRANT USAGE ON SCHEMA public TO tenthwise_runtime;
    GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA public TO tenthwise_runtime;
    GRANT USAGE, SELECT ON ALL SEQUENCES IN SCHEMA public TO tenthwise_runtime;
    ALTER DEFAULT PRIVILEGES IN SCHEMA public GRANT SELECT, INSERT, UPDATE, DELETE ON TABLES TO tenthwise_runtime;
    ALTER DEFAULT PRIVILEGES IN SCHEMA public GRANT USAGE, SELECT ON SEQUENCES TO tenthwise_runtime;
  END IF;
END $$;
--> statement-breakpoint
-- "Only one may succeed", held by the database: one correction per calibration record, one open
-- quarantine hold per tool, one certificate review per outside-lab record, one revision per limits table.
CREATE UNIQUE INDEX IF NOT EXISTS "calibrations_one_correction_each" ON "calibrations" ("supersedes_id") WHERE "supersedes_id" IS NOT NULL;
--> statement-breakpoint
CREATE UNIQUE INDEX IF NOT EXISTS "holds_one_open_per_tool" ON "holds" ("tool_id") WHERE "released_at" IS NULL;
--> statement-breakpoint
CREATE UNIQUE INDEX IF NOT EXISTS "calibration_reviews_one_per_calibration" ON "calibration_reviews" ("calibration_id");
--> statement-breakpoint
CREATE UNIQUE INDEX IF NOT EXISTS "limit_tables_one_revision_each" ON "limit_tables" ("supersedes_id") WHERE "supersedes_id" IS NOT NULL;
--> statement-breakpoint
-- TRUNCATE skips row triggers: evidence tables also refuse it per statement (the runtime role has no
-- TRUNCATE privilege in the first place; this holds the owner too, short of dropping the trigger).
CREATE OR REPLACE FUNCTION tenthwise_refuse_truncate() RETURNS trigger AS $$
BEGIN
  RAISE EXCEPTION 'record_signed: % holds evidence and is never emptied', TG_TABLE_NAME USING ERRCODE = 'P0001';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
-- The one way to protect a table, for this and later migrations of any branch:
--   SELECT tenthwise_protect_append_only('my_table');            -- never updated or deleted
--   SELECT tenthwise_protect_closed('my_table', 'my_rule'::regproc); -- refused once the row is closed
-- Both add the TRUNCATE guard. tests/api/evidence-protection.api.test.ts finds every table protected
-- this way and tries the forbidden statements on each as the runtime role.
CREATE OR REPLACE FUNCTION tenthwise_protect_append_only(target regclass) RETURNS void AS $$
DECLARE
  t text := (SELECT relname FROM pg_class WHERE oid = target);
BEGIN
  EXECUTE format('DROP TRIGGER IF EXISTS %I ON %s', t || '_append_only', target);
  EXECUTE format('CREATE TRIGGER %I BEFORE UPDATE OR DELETE ON %s FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change()', t || '_append_only', target);
  EXECUTE format('DROP TRIGGER IF EXISTS %I ON %s', t || '_never_emptied', target);
  EXECUTE format('CREATE TRIGGER %I BEFORE TRUNCATE ON %s FOR EACH STATEMENT EXECUTE FUNCTION tenthwise_refuse_truncate()', t || '_never_emptied', target);
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION tenthwise_protect_closed(target regclass, rule regproc) RETURNS void AS $$
DECLARE
  t text := (SELECT relname FROM pg_class WHERE oid = target);
BEGIN
  EXECUTE format('DROP TRIGGER IF EXISTS %I ON %s', t || '_closed', target);
  EXECUTE format('CREATE TRIGGER %I BEFORE UPDATE OR DELETE ON %s FOR EACH ROW EXECUTE FUNCTION %s()', t || '_closed', target, rule);
  EXECUTE format('DROP TRIGGER IF EXISTS %I ON %s', t || '_never_emptied', target);
  EXECUTE format('CREATE TRIGGER %I BEFORE TRUNCATE ON %s FOR EACH STATEMENT EXECUTE FUNCTION tenthwise_refuse_truncate()', t || '_never_emptied', target);
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION tenthwise_refuse_closed(what text) RETURNS void AS $$
BEGIN
  RAISE EXCEPTION 'record_closed: %', what USING ERRCODE = 'P0001';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
-- A closed investigation only reads; its notice bookkeeping (who was e-mailed, when) may still settle.
CREATE OR REPLACE FUNCTION tenthwise_closed_investigations() RETURNS trigger AS $$
DECLARE
  o jsonb := coalesce(OLD.finding, '{}'::jsonb);
  n jsonb := coalesce(NEW.finding, '{}'::jsonb);
BEGIN
  IF TG_OP = 'DELETE' THEN PERFORM tenthwise_refuse_closed('an investigation is never deleted'); END IF;
  IF OLD.status = 'closed' AND (
       (to_jsonb(NEW) - 'finding') IS DISTINCT FROM (to_jsonb(OLD) - 'finding')
    OR (CASE WHEN jsonb_typeof(n) = 'object' THEN n - 'notifications' ELSE n END)
       IS DISTINCT FROM (CASE WHEN jsonb_typeof(o) = 'object' THEN o - 'notifications' ELSE o END)) THEN
    PERFORM tenthwise_refuse_closed('a closed investigation is never changed');
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION tenthwise_closed_investigation_items() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN PERFORM tenthwise_refuse_closed('an affected item of an investigation is never deleted'); END IF;
  IF EXISTS (SELECT 1 FROM investigations i WHERE i.id = OLD.investigation_id AND i.status = 'closed') THEN
    PERFORM tenthwise_refuse_closed('the items of a closed investigation are never changed');
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
-- A job signed by an inspector keeps the header it was signed under; a job with readings is never deleted.
CREATE OR REPLACE FUNCTION tenthwise_closed_jobs() RETURNS trigger AS $$
BEGIN
  IF EXISTS (SELECT 1 FROM job_signoffs s WHERE s.job_id = OLD.id) THEN
    RAISE EXCEPTION 'record_signed: a signed check sheet is never changed or deleted' USING ERRCODE = 'P0001';
  END IF;
  IF TG_OP = 'DELETE' AND EXISTS (SELECT 1 FROM readings r WHERE r.job_id = OLD.id) THEN
    PERFORM tenthwise_refuse_closed('a check sheet holding readings is never deleted');
  END IF;
  RETURN CASE WHEN TG_OP = 'DELETE' THEN OLD ELSE NEW END;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
-- A limits table a job was opened on is the revision that job was judged against: frozen, items too.
CREATE OR REPLACE FUNCTION tenthwise_closed_limit_tables() RETURNS trigger AS $$
BEGIN
  IF EXISTS (SELECT 1 FROM jobs j WHERE j.limit_table_id = OLD.id) THEN
    PERFORM tenthwise_refuse_closed('a limits table in use by a check sheet is never changed; issue a revision');
  END IF;
  RETURN CASE WHEN TG_OP = 'DELETE' THEN OLD ELSE NEW END;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION tenthwise_closed_limit_items() RETURNS trigger AS $$
BEGIN
  IF EXISTS (SELECT 1 FROM jobs j WHERE j.limit_table_id = OLD.limit_table_id) THEN
    PERFORM tenthwise_refuse_closed('the limits of a table in use by a check sheet are never changed; issue a revision');
  END IF;
  RETURN CASE WHEN TG_OP = 'DELETE' THEN OLD ELSE NEW END;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
-- A standard's certificate is the lab's statement: its values never change; its scanned file may be
-- attached once, where none was.
CREATE OR REPLACE FUNCTION tenthwise_closed_standard_certificates() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN PERFORM tenthwise_refuse_closed('a standard''s certificate is never deleted'); END IF;
  IF (to_jsonb(NEW) - 'file_key') IS DISTINCT FROM (to_jsonb(OLD) - 'file_key')
     OR (OLD.file_key IS NOT NULL AND NEW.file_key IS DISTINCT FROM OLD.file_key) THEN
    PERFORM tenthwise_refuse_closed('a standard''s certificate is never changed (its file is attached once)');
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
-- Custody and holds: an open record is closed once (returned, received, released, rejected) and then only reads.
CREATE OR REPLACE FUNCTION tenthwise_closed_holds() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN PERFORM tenthwise_refuse_closed('a quarantine hold is never deleted'); END IF;
  IF OLD.released_at IS NOT NULL THEN PERFORM tenthwise_refuse_closed('a released hold is never changed'); END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION tenthwise_closed_checkouts() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN PERFORM tenthwise_refuse_closed('a checkout is never deleted'); END IF;
  IF OLD.returned_at IS NOT NULL THEN PERFORM tenthwise_refuse_closed('a returned checkout is never changed'); END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION tenthwise_closed_lab_shipments() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN PERFORM tenthwise_refuse_closed('a lab shipment is never deleted'); END IF;
  IF OLD.received_at IS NOT NULL THEN PERFORM tenthwise_refuse_closed('a received shipment is never changed'); END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION tenthwise_closed_set_elements() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN PERFORM tenthwise_refuse_closed('an element of a set is never deleted; reject it'); END IF;
  IF OLD.rejected_at IS NOT NULL THEN PERFORM tenthwise_refuse_closed('a rejected element is never changed'); END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
-- A stored file is named by one record, once.
CREATE OR REPLACE FUNCTION tenthwise_closed_stored_files() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN PERFORM tenthwise_refuse_closed('a stored file is never forgotten'); END IF;
  IF OLD.claimed_by IS NOT NULL
     OR (to_jsonb(NEW) - 'claimed_by' - 'claimed_at') IS DISTINCT FROM (to_jsonb(OLD) - 'claimed_by' - 'claimed_at') THEN
    PERFORM tenthwise_refuse_closed('a stored file belongs to the record that named it');
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
SELECT tenthwise_protect_append_only(t::regclass) FROM unnest(ARRAY[
  'calibrations', 'calibration_points', 'calibration_standards', 'calibration_reviews', 'intermediate_checks',
  'readings', 'reading_tools', 'job_signoffs', 'dispositions', 'audit_events', 'tool_lifecycle_events',
  'interval_decisions', 'checkout_refusals'
]) AS t;
--> statement-breakpoint
SELECT tenthwise_protect_closed('investigations', 'tenthwise_closed_investigations');
--> statement-breakpoint
SELECT tenthwise_protect_closed('investigation_items', 'tenthwise_closed_investigation_items');
--> statement-breakpoint
SELECT tenthwise_protect_closed('jobs', 'tenthwise_closed_jobs');
--> statement-breakpoint
SELECT tenthwise_protect_closed('limit_tables', 'tenthwise_closed_limit_tables');
--> statement-breakpoint
SELECT tenthwise_protect_closed('limit_items', 'tenthwise_closed_limit_items');
--> statement-breakpoint
SELECT tenthwise_protect_closed('standard_certificates', 'tenthwise_closed_standard_certificates');
--> statement-breakpoint
SELECT tenthwise_protect_closed('holds', 'tenthwise_closed_holds');
--> statement-breakpoint
SELECT tenthwise_protect_closed('checkouts', 'tenthwise_closed_checkouts');
--> statement-breakpoint
SELECT tenthwise_protect_closed('lab_shipments', 'tenthwise_closed_lab_shipments');
--> statement-breakpoint
SELECT tenthwise_protect_closed('set_elements', 'tenthwise_closed_set_elements');
--> statement-breakpoint
SELECT tenthwise_protect_closed('stored_files', 'tenthwise_closed_stored_files');
