import { randomBytes } from "node:crypto";
import type { Db } from "../../server/db/client";
import { families, tools, setElements, standards, standardCertificates, labs, calibrations, calibrationPoints, calibrationStandards, checkouts, users } from "../../server/db/schema";

// Typed factories that write straight to the database, for arranging a test's
// world quickly. What a test asserts goes through the API.
const uid = () => randomBytes(3).toString("hex").toUpperCase();

export async function makeFamily(db: Db, over: Partial<typeof families.$inferInsert> = {}) {
  const [row] = await db
    .insert(families)
    .values({
      name: `Outside micrometer 0-1 in ${uid()}`,
      kind: "outside_micrometer",
      unit: "in",
      defaultIntervalDays: 365,
      mpe: "0.0001",
      resolution: "0.0001",
      checkTolerance: "0.0001",
      checkPoints: ["0.105", "0.210", "0.315", "0.420", "0.500", "0.605", "0.710", "0.815", "0.920", "1.000"].map((n) => ({ nominal: n })),
      ...over,
    })
    .returning();
  return row;
}

export async function makeTool(db: Db, over: Partial<typeof tools.$inferInsert> & { familyId?: string } = {}) {
  const familyId = over.familyId ?? (await makeFamily(db)).id;
  const [row] = await db
    .insert(tools)
    .values({
      assetTag: `T-${uid()}`,
      description: "Outside micrometer 0-1 in",
      serialNumber: `SN-${uid()}`,
      unit: "in",
      rangeMin: "0",
      rangeMax: "1",
      resolution: "0.0001",
      intervalDays: 365,
      ...over,
      familyId,
    })
    .returning();
  return row;
}

/** A feeler set with leaves of the given nominal thicknesses. */
export async function makeFeelerSet(db: Db, leaves: string[], over: Partial<typeof tools.$inferInsert> = {}) {
  const fam = await makeFamily(db, { kind: "feeler_set", name: `Feeler set ${uid()}`, mpe: "0.0002", checkPoints: [] });
  const tool = await makeTool(db, { familyId: fam.id, description: "Feeler set", rangeMin: leaves[0], rangeMax: leaves[leaves.length - 1], resolution: "0.0001", ...over });
  const elements = await db
    .insert(setElements)
    .values(leaves.map((n) => ({ toolId: tool.id, label: n, nominal: n })))
    .returning();
  return { tool, elements };
}

export async function makeLab(db: Db, over: Partial<typeof labs.$inferInsert> = {}) {
  const [row] = await db.insert(labs).values({ name: `Lab ${uid()}`, accreditationBody: "Demo Accreditation Board", accreditationNumber: `AC-${uid()}`, accreditationExpiresAt: "2030-01-01", ...over }).returning();
  return row;
}

/** A reference standard with one certificate (in calibration from issuedAt through dueAt). */
export async function makeStandard(db: Db, over: Partial<typeof standards.$inferInsert> = {}, cert: Partial<typeof standardCertificates.$inferInsert> = {}) {
  const [std] = await db.insert(standards).values({ assetTag: `STD-${uid()}`, name: "Gauge block set, inch, grade 0", kind: "gauge_block_set", unit: "in", ...over }).returning();
  const [certificate] = await db
    .insert(standardCertificates)
    .values({ standardId: std.id, number: `C-${uid()}`, labName: "Demo Metrology Lab", issuedAt: "2026-01-10", dueAt: "2027-01-10", expandedUncertainty: "0.000004", coverageFactor: "2", nationalInstitute: "National measurement institute (demo)", ...cert })
    .returning();
  return { standard: std, certificate };
}

/**
 * A calibration record as it would have been signed: all points pass unless
 * told otherwise; nextDueAt must be given (calendar date).
 */
export async function makeCalibration(
  db: Db,
  toolId: string,
  over: Partial<typeof calibrations.$inferInsert> & { performedAt: Date; nextDueAt: string },
  points: { nominal: string; asFound: string; asLeft?: string; mpe?: string }[] = [{ nominal: "0.500", asFound: "0.5000" }],
  standardIds: string[] = [],
) {
  const [cal] = await db
    .insert(calibrations)
    .values({ toolId, decisionRule: "simple", result: "pass", asFoundInTolerance: true, intervalDays: 365, ...over })
    .returning();
  await db.insert(calibrationPoints).values(
    points.map((p, i) => {
      const err = (Number(p.asFound) - Number(p.nominal)).toFixed(7);
      return {
        calibrationId: cal.id,
        seq: i + 1,
        nominal: p.nominal,
        reference: p.nominal,
        asFound: p.asFound,
        asLeft: p.asLeft ?? null,
        errorAsFound: err,
        errorAsLeft: p.asLeft ? (Number(p.asLeft) - Number(p.nominal)).toFixed(7) : null,
        mpe: p.mpe ?? "0.0001",
        asFoundInTolerance: Math.abs(Number(err)) <= Number(p.mpe ?? "0.0001"),
        verdict: "pass" as const,
      };
    }),
  );
  if (standardIds.length) await db.insert(calibrationStandards).values(standardIds.map((standardId) => ({ calibrationId: cal.id, standardId })));
  return cal;
}

export async function makeCheckout(db: Db, toolId: string, userId: string, over: Partial<typeof checkouts.$inferInsert> = {}) {
  const [row] = await db
    .insert(checkouts)
    .values({ toolId, userId, issuedAt: new Date("2026-06-15T13:00:00Z"), dueBackAt: new Date("2026-06-15T22:00:00Z"), ...over })
    .returning();
  return row;
}

export async function findUserByEmail(db: Db, email: string) {
  return db.query.users.findFirst({ where: (u, { eq }) => eq(u.email, email) });
}
export { users };
