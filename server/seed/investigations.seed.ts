import { eq } from "drizzle-orm";
import type { SeedContext } from "./seed-context";
import { standards } from "../db/schema";
import { calibrationsService } from "../modules/calibrations/calibrations.service";
import { deliverPendingNotices } from "../modules/investigations/investigations.notify";
import { addDispositions, listItems } from "../modules/investigations/investigations.service";
import { CreateCalibrationSchema } from "../../shared/calibrations/calibrations.schemas";
import { CreateDispositionSchema } from "../../shared/investigations/investigations.schemas";

// Today MIC-0104 comes back from the bench calibration with its as-found point at 0.500 in reading +0.0003 in
// (permissible ± 0.0001 in): it is adjusted, and the investigation opens by itself over the demo jobs' readings.
// All values are invented demo data.
const NOMINALS = [0.105, 0.21, 0.315, 0.42, 0.5, 0.605, 0.71, 0.815, 0.92, 1];
const AS_FOUND: Record<number, number> = { 0.42: 0.4201, 0.5: 0.5003, 0.605: 0.6052 };

export async function seedInvestigations(ctx: SeedContext): Promise<void> {
  const { db, config } = ctx;
  const now = ctx.clock.now();
  const quality = ctx.users.quality;
  const gaugeBlocks = await db.query.standards.findFirst({ where: eq(standards.assetTag, "GBS-01") });
  // Recorded through the calibration service, which opens the investigation in its own transaction. Without a
  // mailer there, the notices wait as pending and are sent here, once, after it committed.
  const cal = await calibrationsService({ db, clock: ctx.clock, storage: ctx.storage, defaultTimeZone: config.SHOP_TIME_ZONE }).create(
    "MIC-0104",
    CreateCalibrationSchema.parse({
      performedAt: new Date(now.getTime() - 30 * 60_000).toISOString(),
      temperatureC: 20.4,
      humidityPct: 41,
      standardIds: gaugeBlocks ? [gaugeBlocks.id] : [],
      decisionRule: "simple",
      adjusted: true,
      points: NOMINALS.map((nominal) => ({ nominal, reference: nominal, asFound: AS_FOUND[nominal] ?? nominal, asLeft: nominal })),
      notes: "Anvil faces found worn near mid-range; lapped and re-set to zero (demo).",
    }),
    quality.id,
  );
  const investigationId = cal.investigationId;
  if (!investigationId) throw new Error("Investigations seed: the as-found failure of MIC-0104 did not open an investigation");
  await deliverPendingNotices(db, ctx.mailer, ctx.clock);

  // One reading whose verdict holds over the whole error band is already answered by the quality manager; the rest
  // wait for the demo user.
  const holding = await listItems(db, investigationId, { couldChange: false, pageSize: 1 });
  const first = holding.items[0];
  if (!first) throw new Error("Investigations seed: expected one reading of MIC-0104 whose verdict holds over its error band");
  {
    await addDispositions(
      db,
      ctx.clock,
      investigationId,
      CreateDispositionSchema.parse({
        itemIds: [first.id],
        kind: "no_impact",
        rationale:
          `Re-judged over the error band found (the largest error at any check point, +0.0003 in at 0.500 in, with its uncertainty, applied with both signs): every reading of ${first.itemLabel} no. ${first.index} and each place it feeds stay inside their limits; the verdict stands (demo).`,
      }),
      { id: quality.id, name: quality.name },
    );
  }
  ctx.shared.investigationId = investigationId;
}
