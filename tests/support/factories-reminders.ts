import { sql } from "drizzle-orm";
import type { Db } from "../../server/db/client";
import { makeCalibration, makeCheckout, makeTool } from "./factories";

/**
 * A tool in service whose calibration runs out on `dueAt`, optionally issued
 * to someone (due back at `dueBackAt`) or owned by a mechanic, with a usage
 * limit and uses already taken.
 */
export async function makeDueTool(
  db: Db,
  opts: {
    assetTag: string;
    dueAt: string;
    description?: string;
    location?: string | null;
    calibratedAt?: string;
    issuedTo?: string;
    issuedAt?: string;
    dueBackAt?: string;
    ownerUserId?: string;
    usageLimit?: number;
    usesTaken?: number;
  },
) {
  const tool = await makeTool(db, {
    assetTag: opts.assetTag,
    description: opts.description ?? "Outside micrometer 0-1 in",
    location: opts.location === undefined ? "Crib cabinet B, drawer 2" : opts.location,
    usageLimit: opts.usageLimit ?? null,
    ...(opts.ownerUserId ? { ownerType: "personal" as const, ownerUserId: opts.ownerUserId } : {}),
  });
  const performedAt = new Date(opts.calibratedAt ?? "2025-07-01T15:00:00Z");
  const cal = await makeCalibration(db, tool.id, { performedAt, nextDueAt: opts.dueAt });
  // Past uses: returned check-outs after the calibration, one day apart.
  for (let i = 0; i < (opts.usesTaken ?? 0); i++) {
    const out = new Date(performedAt.getTime() + (i + 1) * 86_400_000);
    await makeCheckout(db, tool.id, opts.issuedTo ?? opts.ownerUserId ?? (await anyUser(db)), { issuedAt: out, dueBackAt: new Date(out.getTime() + 8 * 3_600_000), returnedAt: new Date(out.getTime() + 7 * 3_600_000) });
  }
  if (opts.issuedTo) {
    await makeCheckout(db, tool.id, opts.issuedTo, {
      issuedAt: new Date(opts.issuedAt ?? "2026-06-15T13:00:00Z"),
      dueBackAt: new Date(opts.dueBackAt ?? "2026-06-15T22:00:00Z"),
    });
  }
  return { tool, calibration: cal };
}

async function anyUser(db: Db) {
  const u = await db.query.users.findFirst();
  return u!.id;
}

/** A later calibration of the tool that moves its due date (a new recall cycle). */
export async function recalibrate(db: Db, toolId: string, performedAt: string, nextDueAt: string) {
  return makeCalibration(db, toolId, { performedAt: new Date(performedAt), nextDueAt });
}

/**
 * Takes every tool of earlier tests out of the reminder job's view (retired,
 * returned) and clears preferences, so one test file can arrange several shops
 * in turn on its one app.
 */
export async function clearShop(db: Db) {
  await db.execute(sql`update tools set lifecycle = 'retired' where lifecycle <> 'retired'`);
  await db.execute(sql`update checkouts set returned_at = issued_at where returned_at is null`);
  await db.execute(sql`delete from notification_preferences`);
}
