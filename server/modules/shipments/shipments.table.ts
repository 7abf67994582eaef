import { sql } from "drizzle-orm";
import { pgTable, uuid, text, date, timestamp, index, uniqueIndex } from "drizzle-orm/pg-core";
import { tools } from "../tools/tools.table";
import { users } from "../users/users.table";
import { labs } from "../labs/labs.table";
import { calibrations } from "../calibrations/calibrations.table";

/** Tools sent to an outside calibration lab and received back. */
export const labShipments = pgTable(
  "lab_shipments",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    toolId: uuid("tool_id").notNull().references(() => tools.id),
    labId: uuid("lab_id").notNull().references(() => labs.id),
    shippedAt: timestamp("shipped_at", { withTimezone: true }).notNull(),
    shippedBy: uuid("shipped_by").references(() => users.id),
    purchaseOrder: text("purchase_order"),
    expectedBackAt: date("expected_back_at"),
    receivedAt: timestamp("received_at", { withTimezone: true }),
    receivedBy: uuid("received_by").references(() => users.id),
    calibrationId: uuid("calibration_id").references(() => calibrations.id),
  },
  (t) => [
    uniqueIndex("lab_shipments_one_open_per_tool").on(t.toolId).where(sql`${t.receivedAt} is null`),
    index("lab_shipments_tool_idx").on(t.toolId, t.shippedAt),
    index("lab_shipments_lab_idx").on(t.labId),
    index("lab_shipments_shipped_by_idx").on(t.shippedBy),
    index("lab_shipments_received_by_idx").on(t.receivedBy),
    index("lab_shipments_calibration_idx").on(t.calibrationId),
  ],
);
