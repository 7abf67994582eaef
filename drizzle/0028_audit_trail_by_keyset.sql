DROP INDEX "audit_events_actor_idx";--> statement-breakpoint
DROP INDEX "audit_events_at_idx";--> statement-breakpoint
CREATE INDEX "audit_events_actor_at_idx" ON "audit_events" USING btree ("actor_id","at","id");--> statement-breakpoint
CREATE INDEX "audit_events_at_id_idx" ON "audit_events" USING btree ("at","id");