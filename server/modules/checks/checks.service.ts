import { checkPointOutsideRange } from "../../../shared/tools/check-range";
import { checksRepository, type CheckRow } from "./checks.repository";
import { getToolRow } from "../tools/tools.service";
import { getFamilyRow } from "../families/families.service";
import { standardsRepository } from "../standards/standards.repository";
import { statusContext, statusOf } from "../tools/tool-status.service";
import { onOutOfToleranceFinding } from "../investigations/investigations.hooks";
import { recordAudit } from "../audit/audit.repository";
import { AppError, notFound, refused } from "../../http/errors";
import { calendarDate } from "../../../shared/common/dates";
import { dec } from "../../../shared/common/decimal";
import type { Check, CheckResult, CreateCheck } from "../../../shared/calibrations/calibrations.schemas";
import type { Page } from "../../../shared/common/lists.schemas";
import { fromDb, toDb, unknownReference, type RegisterDeps } from "../tools/register.common";
import type { DbOrTx } from "../../db/client";

async function toChecks(db: DbOrTx, rows: CheckRow[]): Promise<Check[]> {
  const names = await checksRepository.names(db, rows);
  return rows.map((r) => ({
    id: r.id,
    performedAt: r.performedAt.toISOString(),
    performedBy: r.performedBy ? { id: r.performedBy, name: names.users.get(r.performedBy) ?? "" } : null,
    standard: r.standardId ? (names.standards.get(r.standardId) ?? null) : null,
    nominal: fromDb(r.nominal),
    reading: fromDb(r.reading),
    deviation: fromDb(r.deviation),
    tolerance: fromDb(r.tolerance),
    passed: r.passed,
    context: r.context,
    note: r.note,
  }));
}

export function checksService(deps: RegisterDeps) {
  const { db, clock, defaultTimeZone } = deps;
  return {
    async listForTool(assetTag: string, page: number, pageSize: number): Promise<Page<Check>> {
      const tool = await getToolRow(db, assetTag);
      const { items, total } = await checksRepository.listForTool(db, tool.id, page, pageSize);
      return { items: await toChecks(db, items), total };
    },

    /**
     * An intermediate (pre-use) check: deviation = reading − nominal, exactly,
     * against the family's check tolerance (its MPE when none is set). A
     * failure takes the tool out of use at once and opens its investigation.
     */
    async create(assetTag: string, input: CreateCheck, actorId: string | null, context: CheckRow["context"] = "pre_use"): Promise<CheckResult> {
      const tool = await getToolRow(db, assetTag);
      if (tool.lifecycle === "retired") throw refused("tool_retired", `${tool.assetTag} is retired; it is not checked any more.`);
      // A check point the tool cannot read (nominal 500 on a 0–1 in micrometer) is a slip of the keyboard.
      const message = checkPointOutsideRange(input.nominal, tool);
      if (message) {
        throw new AppError("check_outside_range", 400, message, [{ code: "custom", path: ["nominal"], message }]);
      }
      const family = await getFamilyRow(db, tool.familyId);
      const toleranceText = family.checkTolerance ?? family.mpe;
      if (toleranceText == null) throw refused("no_check_tolerance", `The family "${family.name}" sets no check tolerance or permissible error; set one before recording checks.`);
      const ctx = await statusContext(db, defaultTimeZone);
      const now = clock.now();
      if (input.standardId) {
        const std = await standardsRepository.findById(db, input.standardId);
        if (!std) throw unknownReference("standard", input.standardId);
        const day = calendarDate(now, ctx.timeZone);
        const covering = await standardsRepository.coveringCertificates(db, [std.id], day);
        if (!covering.has(std.id)) throw refused("standard_not_in_calibration", `${std.assetTag} is not in calibration today; check against a standard that is.`, [{ assetTag: std.assetTag }]);
      }
      const deviation = dec(input.reading).minus(dec(input.nominal));
      // Exact comparison: a deviation on the tolerance passes.
      const passed = deviation.abs().lte(dec(toleranceText));
      const { row, investigationId } = await db.transaction(async (tx) => {
        const row = await checksRepository.insert(tx, {
          toolId: tool.id,
          performedAt: now,
          performedBy: actorId,
          standardId: input.standardId ?? null,
          nominal: toDb(input.nominal),
          reading: toDb(input.reading),
          deviation: toDb(deviation),
          tolerance: toDb(toleranceText),
          passed,
          context,
          note: input.note ?? null,
        });
        await recordAudit(tx, { actorId, action: passed ? "check.pass" : "check.fail", entityType: "intermediate_check", entityId: row.id, after: { assetTag: tool.assetTag, ...row }, at: now });
        const opened = passed ? null : await onOutOfToleranceFinding(tx, { clock, mailer: deps.mailer, logger: deps.logger, timeZone: ctx.timeZone }, { kind: "check_failure", toolId: tool.id, checkId: row.id, at: now, actorId });
        return { row, investigationId: opened?.investigationId ?? null };
      });
      const [check] = await toChecks(db, [row]);
      const v = await statusOf(db, tool.id, now, ctx);
      return { ...check, toolStatus: v.status, usable: v.usable, investigationId };
    },

    async refuseChange(id: string): Promise<never> {
      if (!(await checksRepository.findById(db, id))) throw notFound("check", id);
      throw refused("record_signed", "A recorded check is never changed or deleted; record a new check.");
    },
  };
}

