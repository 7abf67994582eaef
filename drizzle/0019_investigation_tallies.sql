CREATE TABLE "investigation_tallies" (
	"investigation_id" uuid PRIMARY KEY NOT NULL,
	"items" integer DEFAULT 0 NOT NULL,
	"disposed_items" integer DEFAULT 0 NOT NULL
);
--> statement-breakpoint
DROP INDEX "investigation_items_investigation_idx";--> statement-breakpoint
ALTER TABLE "investigation_tallies" ADD CONSTRAINT "investigation_tallies_investigation_id_investigations_id_fk" FOREIGN KEY ("investigation_id") REFERENCES "public"."investigations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
-- Kept by the database in the transaction of each statement that adds affected items: one row per investigation,
-- added to once per statement (a batch of thousands of items is one update). Security definer: the app only reads it.
CREATE OR REPLACE FUNCTION tenthwise_investigation_items_tally() RETURNS trigger
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
BEGIN
  INSERT INTO investigation_tallies (investigation_id, items)
  SELECT a.investigation_id, count(*) FROM added a GROUP BY a.investigation_id
  ON CONFLICT (investigation_id) DO UPDATE SET items = investigation_tallies.items + excluded.items;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER investigation_items_tally AFTER INSERT ON investigation_items REFERENCING NEW TABLE AS added
  FOR EACH STATEMENT EXECUTE FUNCTION tenthwise_investigation_items_tally();
--> statement-breakpoint
-- An item counts as disposed from its first disposition; a disposition that replaces another (or a second one in the
-- same statement) does not count it again. The tallies of the investigations involved are locked first, so two
-- transactions disposing of the same item one after the other each see what the other committed.
CREATE OR REPLACE FUNCTION tenthwise_dispositions_tally() RETURNS trigger
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
BEGIN
  PERFORM 1 FROM investigation_tallies t
  WHERE t.investigation_id IN (SELECT a.investigation_id FROM added a)
  ORDER BY t.investigation_id FOR UPDATE;
  UPDATE investigation_tallies t SET disposed_items = t.disposed_items + n.items
  FROM (
    SELECT a.investigation_id, count(DISTINCT a.investigation_item_id) AS items FROM added a
    WHERE NOT EXISTS (SELECT 1 FROM dispositions d
                      WHERE d.investigation_item_id = a.investigation_item_id AND d.id NOT IN (SELECT x.id FROM added x))
    GROUP BY a.investigation_id
  ) n
  WHERE t.investigation_id = n.investigation_id;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER dispositions_tally AFTER INSERT ON dispositions REFERENCING NEW TABLE AS added
  FOR EACH STATEMENT EXECUTE FUNCTION tenthwise_dispositions_tally();
--> statement-breakpoint
-- The investigations already on record.
INSERT INTO investigation_tallies (investigation_id, items, disposed_items)
SELECT v.id,
  (SELECT count(*) FROM investigation_items i WHERE i.investigation_id = v.id),
  (SELECT count(DISTINCT d.investigation_item_id) FROM dispositions d WHERE d.investigation_id = v.id)
FROM investigations v
ON CONFLICT (investigation_id) DO NOTHING;
