ALTER TABLE "investigation_items" ADD COLUMN "sheet_serial" text;--> statement-breakpoint
ALTER TABLE "investigation_items" ADD COLUMN "taken_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "investigation_items" ADD COLUMN "place_index" integer;--> statement-breakpoint
ALTER TABLE "investigation_items" ADD COLUMN "recorded_verdict" text;--> statement-breakpoint
-- Existing items take their copies from their readings (or calibrations); closed investigations' items are evidence
-- guarded by a trigger, which is set aside for this one backfill of new columns only.
ALTER TABLE "investigation_items" DISABLE TRIGGER "investigation_items_closed";--> statement-breakpoint
UPDATE "investigation_items" i SET "sheet_serial" = j."engine_serial", "taken_at" = r."taken_at", "place_index" = r."index", "recorded_verdict" = r."verdict"
  FROM "readings" r JOIN "jobs" j ON j."id" = r."job_id" WHERE r."id" = i."reading_id";--> statement-breakpoint
UPDATE "investigation_items" i SET "taken_at" = c."performed_at" FROM "calibrations" c WHERE c."id" = i."calibration_id" AND i."reading_id" IS NULL;--> statement-breakpoint
ALTER TABLE "investigation_items" ENABLE TRIGGER "investigation_items_closed";--> statement-breakpoint
CREATE INDEX "investigation_items_page_idx" ON "investigation_items" USING btree ("investigation_id","verdict_could_change" DESC NULLS FIRST,"sheet_serial" NULLS FIRST,"taken_at","place_index" NULLS FIRST,"id");