import { pgTable, bigserial, text, jsonb, timestamp, uuid, index } from "drizzle-orm/pg-core";
import { users } from "../users/users.table";

// Who did what and when. Rows are only ever inserted (a trigger refuses
// UPDATE and DELETE; see the migration).
export const auditEvents = pgTable(
  "audit_events",
  {
    id: bigserial("id", { mode: "number" }).primaryKey(),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
    actorId: uuid("actor_id").references(() => users.id),
    action: text("action").notNull(),
    entityType: text("entity_type").notNull(),
    entityId: text("entity_id").notNull(),
    before: jsonb("before"),
    after: jsonb("after"),
  },
  // The trail is read newest first, by (at, id): whole (a page by keyset off the first index) or by one person.
  (t) => [
    index("audit_events_entity_idx").on(t.entityType, t.entityId),
    index("audit_events_actor_at_idx").on(t.actorId, t.at, t.id),
    index("audit_events_at_id_idx").on(t.at, t.id),
  ],
);
