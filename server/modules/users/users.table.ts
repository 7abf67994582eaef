import { pgTable, uuid, text, boolean, timestamp, uniqueIndex, index } from "drizzle-orm/pg-core";

export const users = pgTable(
  "users",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    email: text("email").notNull(),
    name: text("name").notNull(),
    role: text("role", { enum: ["mechanic", "crib", "inspector", "quality", "auditor", "admin"] }).notNull(),
    passwordHash: text("password_hash").notNull(),
    active: boolean("active").notNull().default(true),
    badgeCode: text("badge_code"),
    certificateNumber: text("certificate_number"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    deactivatedAt: timestamp("deactivated_at", { withTimezone: true }),
  },
  (t) => [uniqueIndex("users_email_key").on(t.email), uniqueIndex("users_badge_code_key").on(t.badgeCode), index("users_role_idx").on(t.role)],
);
