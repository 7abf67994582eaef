import { sql } from "drizzle-orm";
import { pgTable, uuid, text, timestamp, index, uniqueIndex } from "drizzle-orm/pg-core";
import { tools } from "../tools/tools.table";
import { users } from "../users/users.table";

// One open checkout per tool is held by the database (partial unique index),
// so simultaneous issues of one tool give one success and clean refusals.
export const checkouts = pgTable(
  "checkouts",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    toolId: uuid("tool_id").notNull().references(() => tools.id),
    userId: uuid("user_id").notNull().references(() => users.id),
    issuedBy: uuid("issued_by").references(() => users.id),
    issuedAt: timestamp("issued_at", { withTimezone: true }).notNull(),
    dueBackAt: timestamp("due_back_at", { withTimezone: true }).notNull(),
    workOrder: text("work_order"),
    engineSerial: text("engine_serial"),
    returnedAt: timestamp("returned_at", { withTimezone: true }),
    returnedBy: uuid("returned_by").references(() => users.id),
    returnCondition: text("return_condition", { enum: ["ok", "damaged"] }),
    returnNote: text("return_note"),
    returnPhotoKey: text("return_photo_key"),
  },
  (t) => [
    uniqueIndex("checkouts_one_open_per_tool").on(t.toolId).where(sql`${t.returnedAt} is null`),
    index("checkouts_tool_issued_idx").on(t.toolId, t.issuedAt),
    index("checkouts_user_idx").on(t.userId),
    index("checkouts_issued_by_idx").on(t.issuedBy),
    index("checkouts_returned_by_idx").on(t.returnedBy),
    index("checkouts_open_due_idx").on(t.dueBackAt).where(sql`${t.returnedAt} is null`),
  ],
);

/** Refused issues, kept so the crib can show why a tool was turned away. */
export const checkoutRefusals = pgTable(
  "checkout_refusals",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    toolId: uuid("tool_id").notNull().references(() => tools.id),
    userId: uuid("user_id").references(() => users.id),
    refusedBy: uuid("refused_by").references(() => users.id),
    at: timestamp("at", { withTimezone: true }).notNull(),
    code: text("code").notNull(),
    reason: text("reason").notNull(),
  },
  (t) => [index("checkout_refusals_tool_idx").on(t.toolId), index("checkout_refusals_user_idx").on(t.userId), index("checkout_refusals_by_idx").on(t.refusedBy)],
);
