CREATE TABLE "sheet_references" (
	"id" smallint PRIMARY KEY NOT NULL,
	"version" bigint DEFAULT 0 NOT NULL
);
--> statement-breakpoint
ALTER TABLE "job_activity" ADD COLUMN "sheet_version" bigint DEFAULT 0 NOT NULL;--> statement-breakpoint
-- A check sheet's answer is kept by the app while what it shows is unchanged (docs/decisions/020-kept-check-sheets.md).
-- What it shows of its own records moves job_activity.sheet_version; what it shows of records shared by many sheets
-- moves the one row of sheet_references. Both are kept here, in the transaction of the change; the app only reads them.
INSERT INTO "sheet_references" ("id", "version") VALUES (1, 0);
--> statement-breakpoint
-- A reading (at commit, as before) and a sign-off move their sheet's version.
CREATE OR REPLACE FUNCTION tenthwise_job_activity_reading() RETURNS trigger
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
BEGIN
  INSERT INTO job_activity (job_id, last_reading_at, readings, sheet_version) VALUES (NEW.job_id, NEW.taken_at, 1, 1)
  ON CONFLICT (job_id) DO UPDATE SET
    last_reading_at = greatest(job_activity.last_reading_at, excluded.last_reading_at),
    readings = job_activity.readings + 1,
    sheet_version = job_activity.sheet_version + 1;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION tenthwise_job_activity_signoffs() RETURNS trigger
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
BEGIN
  INSERT INTO job_activity (job_id, last_signed_at, sheet_version)
  SELECT job_id, max(signed_at), 1 FROM new_rows GROUP BY job_id
  ON CONFLICT (job_id) DO UPDATE SET
    last_signed_at = greatest(job_activity.last_signed_at, excluded.last_signed_at),
    sheet_version = job_activity.sheet_version + 1;
  RETURN NULL;
END $$;
--> statement-breakpoint
-- A reading judged under new rules (the re-judging job) moves its sheet's version. A judgement written with its
-- reading, in the same transaction, does not: the reading moves it at commit, without holding the row any longer.
CREATE OR REPLACE FUNCTION sheet_version_judgements() RETURNS trigger
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
DECLARE
  mine text := (pg_current_xact_id()::text::bigint % 4294967296)::text;
BEGIN
  PERFORM 1 FROM job_activity a
  WHERE a.job_id IN (SELECT r.job_id FROM added n JOIN readings r ON r.id = n.reading_id WHERE r.xmin::text <> mine)
  ORDER BY a.job_id FOR UPDATE;
  UPDATE job_activity a SET sheet_version = a.sheet_version + 1
  WHERE a.job_id IN (SELECT r.job_id FROM added n JOIN readings r ON r.id = n.reading_id WHERE r.xmin::text <> mine);
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER reading_judgements_sheet_version AFTER INSERT ON reading_judgements REFERENCING NEW TABLE AS added
  FOR EACH STATEMENT EXECUTE FUNCTION sheet_version_judgements();
--> statement-breakpoint
-- The records many sheets share: a change that a sheet shows moves the one version row. (Named without the
-- tenthwise_ prefix, which marks the triggers that guard evidence: these tables are not evidence.)
-- Triggered by an UPDATE with its rows before and after, it moves the version only when one of the columns named as
-- the trigger's arguments changed; with no argument, whatever the statement did.
CREATE OR REPLACE FUNCTION sheet_references_moved() RETURNS trigger
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
BEGIN
  -- Two statements: the rows before and after exist only for the triggers that name columns.
  IF TG_NARGS = 0 THEN
    UPDATE sheet_references SET version = version + 1 WHERE id = 1;
  ELSIF EXISTS (
    SELECT 1 FROM old_rows o JOIN new_rows n ON n.id = o.id
    WHERE EXISTS (SELECT 1 FROM unnest(TG_ARGV) c WHERE to_jsonb(n) -> c IS DISTINCT FROM to_jsonb(o) -> c)
  ) THEN
    UPDATE sheet_references SET version = version + 1 WHERE id = 1;
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER users_sheet_references AFTER UPDATE ON users REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
  FOR EACH STATEMENT EXECUTE FUNCTION sheet_references_moved('name');
--> statement-breakpoint
CREATE TRIGGER tools_sheet_references AFTER UPDATE ON tools REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
  FOR EACH STATEMENT EXECUTE FUNCTION sheet_references_moved('asset_tag', 'description', 'unit', 'family_id');
--> statement-breakpoint
CREATE TRIGGER families_sheet_references AFTER UPDATE ON families REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
  FOR EACH STATEMENT EXECUTE FUNCTION sheet_references_moved('kind');
--> statement-breakpoint
-- A limit table's new revision names the one it supersedes, so a new table moves the version too.
CREATE TRIGGER limit_tables_sheet_references AFTER INSERT OR UPDATE OR DELETE ON limit_tables
  FOR EACH STATEMENT EXECUTE FUNCTION sheet_references_moved();
--> statement-breakpoint
CREATE TRIGGER limit_items_sheet_references AFTER UPDATE OR DELETE ON limit_items
  FOR EACH STATEMENT EXECUTE FUNCTION sheet_references_moved();
--> statement-breakpoint
CREATE TRIGGER jobs_sheet_references AFTER UPDATE OR DELETE ON jobs
  FOR EACH STATEMENT EXECUTE FUNCTION sheet_references_moved();
