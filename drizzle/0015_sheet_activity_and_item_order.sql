CREATE TABLE "job_activity" (
	"job_id" uuid PRIMARY KEY NOT NULL,
	"last_reading_at" timestamp with time zone,
	"readings" integer DEFAULT 0 NOT NULL,
	"last_signed_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "investigation_items" ADD COLUMN "job_id" uuid;--> statement-breakpoint
ALTER TABLE "investigation_items" ADD COLUMN "sheet_serial" text;--> statement-breakpoint
ALTER TABLE "investigation_items" ADD COLUMN "taken_by" uuid;--> statement-breakpoint
ALTER TABLE "investigation_items" ADD COLUMN "taken_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "investigation_items" ADD COLUMN "place_index" integer;--> statement-breakpoint
ALTER TABLE "investigation_items" ADD COLUMN "recorded_verdict" text;--> statement-breakpoint
ALTER TABLE "job_activity" ADD CONSTRAINT "job_activity_job_id_jobs_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."jobs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "job_activity_awaiting_idx" ON "job_activity" USING btree ("job_id") WHERE last_reading_at is not null and (last_signed_at is null or last_reading_at > last_signed_at);--> statement-breakpoint
CREATE INDEX "investigation_items_page_idx" ON "investigation_items" USING btree ("investigation_id","verdict_could_change" DESC NULLS FIRST,"sheet_serial" NULLS FIRST,"taken_at","place_index" NULLS FIRST,"id");--> statement-breakpoint
-- Existing items take their copies from their readings (or calibrations); closed investigations' items are evidence
-- guarded by a trigger, which is set aside for this one backfill of new columns only.
ALTER TABLE "investigation_items" DISABLE TRIGGER "investigation_items_closed";--> statement-breakpoint
UPDATE "investigation_items" i SET "job_id" = r."job_id", "sheet_serial" = j."engine_serial", "taken_by" = r."taken_by", "taken_at" = r."taken_at", "place_index" = r."index", "recorded_verdict" = r."verdict"
  FROM "readings" r JOIN "jobs" j ON j."id" = r."job_id" WHERE r."id" = i."reading_id";--> statement-breakpoint
UPDATE "investigation_items" i SET "taken_at" = c."performed_at" FROM "calibrations" c WHERE c."id" = i."calibration_id" AND i."reading_id" IS NULL;--> statement-breakpoint
ALTER TABLE "investigation_items" ENABLE TRIGGER "investigation_items_closed";--> statement-breakpoint
-- Kept by the database, in the transaction of each write: a reading moves its sheet's latest reading and count (at
-- commit: a deferred trigger, so mechanics saving readings on one sheet at once wait for each other only while they
-- commit, not for the whole of each other's write); a sign-off moves its sheet's latest sign-off. Security definer:
-- the app only reads the table.
CREATE OR REPLACE FUNCTION tenthwise_job_activity_reading() RETURNS trigger
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
BEGIN
  INSERT INTO job_activity (job_id, last_reading_at, readings) VALUES (NEW.job_id, NEW.taken_at, 1)
  ON CONFLICT (job_id) DO UPDATE SET
    last_reading_at = greatest(job_activity.last_reading_at, excluded.last_reading_at),
    readings = job_activity.readings + 1;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION tenthwise_job_activity_signoffs() RETURNS trigger
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
BEGIN
  INSERT INTO job_activity (job_id, last_signed_at)
  SELECT job_id, max(signed_at) FROM new_rows GROUP BY job_id
  ON CONFLICT (job_id) DO UPDATE SET last_signed_at = greatest(job_activity.last_signed_at, excluded.last_signed_at);
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE CONSTRAINT TRIGGER readings_job_activity AFTER INSERT ON readings DEFERRABLE INITIALLY DEFERRED
  FOR EACH ROW EXECUTE FUNCTION tenthwise_job_activity_reading();
--> statement-breakpoint
CREATE TRIGGER job_signoffs_job_activity AFTER INSERT ON job_signoffs REFERENCING NEW TABLE AS new_rows
  FOR EACH STATEMENT EXECUTE FUNCTION tenthwise_job_activity_signoffs();
--> statement-breakpoint
-- The sheets already on record.
INSERT INTO job_activity (job_id, last_reading_at, readings, last_signed_at)
SELECT j.id, r.last_at, coalesce(r.n, 0), s.last_at
FROM jobs j
LEFT JOIN (SELECT job_id, max(taken_at) AS last_at, count(*)::int AS n FROM readings GROUP BY job_id) r ON r.job_id = j.id
LEFT JOIN (SELECT job_id, max(signed_at) AS last_at FROM job_signoffs GROUP BY job_id) s ON s.job_id = j.id
WHERE r.job_id IS NOT NULL OR s.job_id IS NOT NULL;
