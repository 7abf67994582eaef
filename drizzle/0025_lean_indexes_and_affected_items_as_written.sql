DROP INDEX "readings_supersedes_idx";--> statement-breakpoint
DROP INDEX "readings_go_leaf_idx";--> statement-breakpoint
DROP INDEX "readings_no_go_leaf_idx";--> statement-breakpoint
DROP INDEX "readings_override_by_idx";--> statement-breakpoint
DROP INDEX "investigation_items_calibration_idx";--> statement-breakpoint
ALTER TABLE "investigation_items" ALTER COLUMN "rejudged" SET DATA TYPE json;--> statement-breakpoint
CREATE INDEX "readings_supersedes_idx" ON "readings" USING btree ("supersedes_id") WHERE "readings"."supersedes_id" is not null;--> statement-breakpoint
CREATE INDEX "readings_go_leaf_idx" ON "readings" USING btree ("go_leaf_id") WHERE "readings"."go_leaf_id" is not null;--> statement-breakpoint
CREATE INDEX "readings_no_go_leaf_idx" ON "readings" USING btree ("no_go_leaf_id") WHERE "readings"."no_go_leaf_id" is not null;--> statement-breakpoint
CREATE INDEX "readings_override_by_idx" ON "readings" USING btree ("override_by") WHERE "readings"."override_by" is not null;--> statement-breakpoint
CREATE INDEX "investigation_items_calibration_idx" ON "investigation_items" USING btree ("calibration_id") WHERE "investigation_items"."calibration_id" is not null;