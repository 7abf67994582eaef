import { pgTable, uuid, text, date, timestamp, uniqueIndex } from "drizzle-orm/pg-core";

export const labs = pgTable(
  "labs",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    name: text("name").notNull(),
    accreditationBody: text("accreditation_body"),
    accreditationNumber: text("accreditation_number"),
    scope: text("scope"),
    accreditationExpiresAt: date("accreditation_expires_at"),
    contact: text("contact"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("labs_name_key").on(t.name)],
);
