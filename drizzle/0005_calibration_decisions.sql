ALTER TABLE "standard_certificates" ADD COLUMN "degrees_of_freedom" numeric;--> statement-breakpoint
ALTER TABLE "calibration_points" ADD COLUMN "guard_band" numeric;--> statement-breakpoint
ALTER TABLE "calibration_points" ADD COLUMN "acceptance_limit" numeric;--> statement-breakpoint
ALTER TABLE "calibration_points" ADD COLUMN "as_found_statement" text;--> statement-breakpoint
ALTER TABLE "calibration_points" ADD COLUMN "released_on" text;--> statement-breakpoint
ALTER TABLE "calibration_points" ADD COLUMN "repeat_readings" jsonb;--> statement-breakpoint
ALTER TABLE "calibration_points" ADD COLUMN "reference_parts" jsonb;--> statement-breakpoint
ALTER TABLE "calibration_points" ADD COLUMN "budget" jsonb;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "temperature_variation_c" numeric;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "guard_band_multiplier" numeric;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "adjusted" boolean;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "as_found_statement" text;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "other_uncertainties" jsonb;--> statement-breakpoint
CREATE INDEX "calibration_points_conditional_idx" ON "calibration_points" USING btree ("calibration_id") WHERE "calibration_points"."as_found_statement" in ('conditional_pass', 'conditional_fail');