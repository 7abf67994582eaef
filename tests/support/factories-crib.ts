import { eq } from "drizzle-orm";
import type { Db } from "../../server/db/client";
import { checkoutRefusals, holds, intermediateChecks, checkouts } from "../../server/db/schema";
import { makeCalibration, makeFamily, makeTool } from "./factories";

// Crib test worlds. Dates suit the test clock of 2026-06-15 (shop in America/Chicago).

/** A tool in calibration: passed on 2026-01-10, due 2027-01-10. */
export async function makeUsableTool(db: Db, over: Parameters<typeof makeTool>[1] = {}, cal: { performedAt?: Date; nextDueAt?: string } = {}) {
  const family = over.familyId ? undefined : await makeFamily(db, { checkTolerance: "0.0001" });
  const tool = await makeTool(db, { ...over, familyId: over.familyId ?? family!.id });
  await makeCalibration(db, tool.id, { performedAt: cal.performedAt ?? new Date("2026-01-10T15:00:00Z"), nextDueAt: cal.nextDueAt ?? "2027-01-10", performedByName: "Demo Technician" });
  return tool;
}

/** A tool whose calibration ran out on 2026-06-01. */
export const makeOverdueTool = (db: Db) => makeUsableTool(db, {}, { performedAt: new Date("2025-06-01T15:00:00Z"), nextDueAt: "2026-06-01" });

/** A usable tool put on hold (quarantined) with a reason. */
export async function makeQuarantinedTool(db: Db, reason = "Dropped on the shop floor") {
  const tool = await makeUsableTool(db);
  await db.insert(holds).values({ toolId: tool.id, placedAt: new Date("2026-06-10T15:00:00Z"), reason });
  return tool;
}

export const refusalsOf = (db: Db, toolId: string) => db.select().from(checkoutRefusals).where(eq(checkoutRefusals.toolId, toolId));
export const checkoutsOf = (db: Db, toolId: string) => db.select().from(checkouts).where(eq(checkouts.toolId, toolId));
export const checksOf = (db: Db, toolId: string) => db.select().from(intermediateChecks).where(eq(intermediateChecks.toolId, toolId));
export const holdsOf = (db: Db, toolId: string) => db.select().from(holds).where(eq(holds.toolId, toolId));
