ALTER TABLE "dispositions" ADD COLUMN "investigation_id" uuid;--> statement-breakpoint
-- Dispositions are evidence (updates refused); the rows on record get their item's investigation with that trigger off.
ALTER TABLE "dispositions" DISABLE TRIGGER "dispositions_append_only";--> statement-breakpoint
UPDATE "dispositions" d SET "investigation_id" = i."investigation_id" FROM "investigation_items" i WHERE i."id" = d."investigation_item_id";--> statement-breakpoint
ALTER TABLE "dispositions" ENABLE TRIGGER "dispositions_append_only";--> statement-breakpoint
ALTER TABLE "dispositions" ALTER COLUMN "investigation_id" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "dispositions" ADD CONSTRAINT "dispositions_investigation_id_investigations_id_fk" FOREIGN KEY ("investigation_id") REFERENCES "public"."investigations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "dispositions_investigation_idx" ON "dispositions" USING btree ("investigation_id","investigation_item_id");
