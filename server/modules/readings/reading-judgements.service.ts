import type { Db } from "../../db/client";
import type { Clock } from "../../platform/clock";
import { readingsRepository, type ReadingJudgementInsert } from "./readings.repository";
import { limitTablesRepository } from "../limit-tables/limit-tables.repository";
import { toItemView } from "../limit-tables/limit-tables.service";
import { evidenceOfRows } from "./reading-evidence";
import { JUDGING_RULES_VERSION, judgeReading, type PlaceView } from "../../../shared/inspection/judging";
import type { LengthUnit } from "../../../shared/common/units";

/**
 * Judges every stored reading not yet judged under the current rules, a batch at a time, and records each verdict as
 * a new row (reading_judgements). Safe to run at any time and from several processes at once: it reads the evidence,
 * never changes it, and a judgement already recorded for a reading and rules version is left as it is. The places
 * built from two readings (clearances, tapers) are judged from these readings whenever a sheet is shown.
 */
export async function judgeStoredReadings(deps: { db: Db; clock: Clock }, opts: { batchSize?: number } = {}): Promise<{ judged: number; changed: number }> {
  const batchSize = opts.batchSize ?? 500;
  let judged = 0;
  let changed = 0;
  for (;;) {
    const batch = await readingsRepository.unjudged(deps.db, JUDGING_RULES_VERSION, batchSize);
    if (batch.length === 0) break;
    const tables = await readingsRepository.tablesOfJobs(deps.db, [...new Set(batch.map((r) => r.jobId))]);
    const tableOf = new Map(tables.map((t) => [t.jobId, t]));
    const itemRows = await limitTablesRepository.itemsOf(deps.db, [...new Set(tables.map((t) => t.tableId))]);
    const at = deps.clock.now();
    const rows: ReadingJudgementInsert[] = [];
    for (const unit of ["in", "mm"] as LengthUnit[]) {
      // Every reading of the batch falls in one group, so each pass records a row for each and the loop ends.
      const mine = batch.filter((r) => (tableOf.get(r.jobId)?.unit ?? "in") === unit);
      const evidence = await evidenceOfRows(deps.db, mine, unit);
      for (const r of mine) {
        const t = tableOf.get(r.jobId);
        const row = t && itemRows.find((i) => i.limitTableId === t.tableId && i.key === r.itemKey);
        let view: PlaceView;
        try {
          if (!row) throw new RangeError(`The item "${r.itemKey}" is not on the job's limits table.`);
          view = judgeReading(toItemView(row), evidence.get(r.id)!, { tableUnit: unit, tableExpansionPerK: t!.expansionPerK == null ? null : Number(t!.expansionPerK) }).view;
        } catch (err) {
          // A reading the rules cannot judge is recorded as pending with the reason, so the pass always moves on.
          view = { kind: "pending", itemKey: r.itemKey, index: r.index, verdict: "pending", band: null, margin: null, text: `Not judged: ${(err as Error).message}` };
        }
        if (view.verdict !== r.verdict && view.verdict !== "pending" && r.verdict !== "pending") changed++;
        rows.push({ readingId: r.id, rulesVersion: JUDGING_RULES_VERSION, verdict: view.verdict, band: view.band, text: view.text, detail: view, judgedAt: at });
      }
    }
    await readingsRepository.insertJudgements(deps.db, rows);
    judged += rows.length;
    if (batch.length < batchSize) break;
  }
  return { judged, changed };
}
