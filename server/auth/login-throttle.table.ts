import { pgTable, text, integer, timestamp, index } from "drizzle-orm/pg-core";

/**
 * Failed sign-ins counted per key (an address, or an address and e-mail) in a fixed window. Kept in
 * PostgreSQL, not in process memory, so every app instance on the database counts the same attempts.
 */
export const loginThrottle = pgTable(
  "login_throttle",
  {
    key: text("key").primaryKey(),
    hits: integer("hits").notNull(),
    resetAt: timestamp("reset_at", { withTimezone: true }).notNull(),
  },
  (t) => [index("login_throttle_reset_idx").on(t.resetAt)],
);
