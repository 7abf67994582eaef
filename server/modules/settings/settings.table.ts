import { pgTable, text, jsonb, timestamp, uuid } from "drizzle-orm/pg-core";
import { users } from "../users/users.table";

export const settings = pgTable("settings", {
  key: text("key").primaryKey(),
  value: jsonb("value").notNull(),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  updatedBy: uuid("updated_by").references(() => users.id),
});
