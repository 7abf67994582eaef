import type { Db } from "../../server/db/client";
import { makeFamily, makeStandard, makeTool } from "./factories";
import type { CreateCalibrationInput } from "../../shared/calibrations/calibrations.schemas";

/** The classic ten sizes that test a 0–1 in micrometer (reference-values.md, common practice, from memory). */
export const INCH_MIC_SIZES = [0.105, 0.21, 0.315, 0.42, 0.5, 0.605, 0.71, 0.815, 0.92, 1.0];

/** A 0–1 in outside micrometer (± 0.0001 in, ASME B89.1.13 secondary source) in its own family, and an inch gauge block set in calibration. */
export async function micrometerBench(db: Db, opts: { toolTag?: string; intervalDays?: number } = {}) {
  const family = await makeFamily(db);
  const tool = await makeTool(db, { familyId: family.id, ...(opts.toolTag ? { assetTag: opts.toolTag } : {}), intervalDays: opts.intervalDays ?? 365 });
  const { standard, certificate } = await makeStandard(db);
  return { family, tool, standard, certificate };
}

/** A calibration body: every classic size read exactly unless `asFound` overrides by nominal. */
export function calibrationBody(standardIds: string[], over: Partial<CreateCalibrationInput> = {}, asFound: Record<string, number> = {}): CreateCalibrationInput {
  return {
    performedAt: "2026-06-15T14:00:00Z",
    temperatureC: 20.2,
    humidityPct: 41,
    standardIds,
    decisionRule: "simple",
    points: INCH_MIC_SIZES.map((n) => ({ nominal: n, asFound: asFound[String(n)] ?? n })),
    ...over,
  };
}
