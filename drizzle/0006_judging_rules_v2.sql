CREATE TABLE "reading_judgements" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"reading_id" uuid NOT NULL,
	"rules_version" integer NOT NULL,
	"verdict" text NOT NULL,
	"band" text,
	"text" text NOT NULL,
	"detail" jsonb NOT NULL,
	"judged_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
ALTER TABLE "limit_items" ADD COLUMN "out_of_round_max" numeric;--> statement-breakpoint
ALTER TABLE "limit_items" ADD COLUMN "station_a_key" text;--> statement-breakpoint
ALTER TABLE "limit_items" ADD COLUMN "station_b_key" text;--> statement-breakpoint
ALTER TABLE "limit_items" ADD COLUMN "expansion_per_k" numeric;--> statement-breakpoint
ALTER TABLE "limit_tables" ADD COLUMN "expansion_per_k" numeric;--> statement-breakpoint
ALTER TABLE "readings" ADD COLUMN "feeler_check" jsonb;--> statement-breakpoint
ALTER TABLE "investigation_items" ADD COLUMN "rejudged" jsonb;--> statement-breakpoint
ALTER TABLE "reading_judgements" ADD CONSTRAINT "reading_judgements_reading_id_readings_id_fk" FOREIGN KEY ("reading_id") REFERENCES "public"."readings"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "reading_judgements_reading_version" ON "reading_judgements" USING btree ("reading_id","rules_version");--> statement-breakpoint
CREATE INDEX "reading_judgements_version_verdict_idx" ON "reading_judgements" USING btree ("rules_version","verdict");