ALTER TABLE "investigations" ADD COLUMN "gathering" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "investigations" ADD COLUMN "rejudged_with" jsonb;--> statement-breakpoint
CREATE INDEX "investigations_gathering_idx" ON "investigations" USING btree ("opened_at") WHERE "investigations"."gathering";