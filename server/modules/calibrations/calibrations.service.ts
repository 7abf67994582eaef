import { calibrationsRepository, type CalibrationRow } from "./calibrations.repository";
import { standardsRepository, type CertificateRow, type StandardRow } from "../standards/standards.repository";
import { certificateFileUrl, getStandardRow } from "../standards/standards.service";
import { labsRepository } from "../labs/labs.repository";
import { shopToday, toLab } from "../labs/labs.service";
import { toolsRepository } from "../tools/tools.repository";
import { getToolRow } from "../tools/tools.service";
import { getFamilyRow } from "../families/families.service";
import { statusContext, statusOf } from "../tools/tool-status.service";
import { onOutOfToleranceFinding } from "../investigations/investigations.hooks";
import { recordAudit } from "../audit/audit.repository";
import { AppError, notFound, refused } from "../../http/errors";
import { computeCalibration, standardForCompute } from "../../../shared/calibrations/calibration-compute";
import { DecisionRuleError, MINIMUM_TUR, nonBinaryStatement, worstStatement } from "../../../shared/calibrations/decision-rules";
import { nextDueAt } from "../../../shared/calibrations/due-dates";
import { calendarDate } from "../../../shared/common/dates";
import { getSettings } from "../settings/settings.service";
import { writeCalibrationPdf } from "./calibrations.pdf";
import type {
  Calibration,
  CalibrationListQuery,
  CertificateReview,
  Chain,
  ConditionalResult,
  ConditionalResultsQuery,
  CreateCalibration,
  UploadedFile,
} from "../../../shared/calibrations/calibrations.schemas";
import type { Page } from "../../../shared/common/lists.schemas";
import { fromDb, fromDbOrNull, toDb, toDbOrNull, unknownReference, type RegisterDeps } from "../tools/register.common";
import type { DbOrTx } from "../../db/client";
import { dec, num } from "../../../shared/common/decimal";
import { isUniqueViolation } from "../../db/errors";
import { claimStoredFile, recordStoredFile } from "../files/files.repository";

export const calibrationCertificateUrl = (c: Pick<CalibrationRow, "id" | "certificateFileKey">) =>
  c.certificateFileKey ? `/api/calibrations/${c.id}/certificate` : null;

/** Calibrations as the API shows them, with their points, standards, review and corrections (batched). */
export async function toCalibrations(db: DbOrTx, rows: CalibrationRow[], tool: { assetTag: string; unit: "in" | "mm" }): Promise<Calibration[]> {
  const rel = await calibrationsRepository.related(db, rows);
  if (!rel) return [];
  const people = new Map(rel.people.map((p) => [p.id, p.name]));
  const labNames = new Map(rel.labs.map((l) => [l.id, l.name]));
  return rows.map((c) => {
    const review = rel.reviews.find((r) => r.review.calibrationId === c.id) ?? null;
    const points = rel.points
      .filter((p) => p.point.calibrationId === c.id)
      .map(({ point: p, elementLabel }) => {
        const mpe = fromDb(p.mpe);
        const U = fromDbOrNull(p.uncertainty);
        const tur = fromDbOrNull(p.tur);
        // Records signed before these were kept: the guard band of their rule, and the statement worked out from what they hold.
        const guardBand = p.guardBand ?? (c.decisionRule !== "simple" && p.uncertainty != null ? p.uncertainty : "0");
        return {
          id: p.id,
          seq: p.seq,
          elementId: p.elementId,
          elementLabel: elementLabel ?? null,
          nominal: fromDb(p.nominal),
          reference: fromDb(p.reference),
          asFound: fromDb(p.asFound),
          asLeft: fromDbOrNull(p.asLeft),
          repeatReadings: p.repeatReadings ? p.repeatReadings.map(Number) : null,
          errorAsFound: fromDb(p.errorAsFound),
          errorAsLeft: fromDbOrNull(p.errorAsLeft),
          mpe,
          uncertainty: U,
          guardBand: fromDb(guardBand),
          acceptanceLimit: p.acceptanceLimit != null ? fromDb(p.acceptanceLimit) : num(dec(p.mpe).minus(dec(guardBand))),
          tur,
          turAdequate: tur == null ? null : tur >= MINIMUM_TUR,
          asFoundInTolerance: p.asFoundInTolerance,
          asFoundStatement: p.asFoundStatement ?? nonBinaryStatement(p.errorAsFound, p.mpe, p.uncertainty),
          releasedOn: p.releasedOn ?? (p.asLeft != null ? ("as_left" as const) : ("as_found" as const)),
          verdict: p.verdict,
          referenceParts: p.referenceParts ?? [],
          budget: p.budget ?? null,
        };
      });
    return {
      id: c.id,
      toolId: c.toolId,
      assetTag: tool.assetTag,
      unit: tool.unit,
      performedAt: c.performedAt.toISOString(),
      performedBy: c.performedBy ? { id: c.performedBy, name: people.get(c.performedBy) ?? "" } : null,
      performedByName: c.performedByName,
      source: c.source,
      lab: c.labId ? { id: c.labId, name: labNames.get(c.labId) ?? "" } : null,
      certificateNumber: c.certificateNumber,
      hasCertificateFile: !!c.certificateFileKey,
      certificateFileUrl: calibrationCertificateUrl(c),
      temperatureC: fromDbOrNull(c.temperatureC),
      temperatureVariationC: fromDbOrNull(c.temperatureVariationC),
      humidityPct: fromDbOrNull(c.humidityPct),
      decisionRule: c.decisionRule,
      guardBandMultiplier: c.guardBandMultiplier != null ? fromDb(c.guardBandMultiplier) : c.decisionRule === "simple" ? 0 : 1,
      adjusted: c.adjusted ?? c.result === "adjusted",
      result: c.result,
      asFoundInTolerance: c.asFoundInTolerance,
      asFoundStatement: c.asFoundStatement ?? worstStatement(points.map((p) => p.asFoundStatement)),
      otherUncertainties: c.otherUncertainties ?? [],
      intervalDays: c.intervalDays,
      nextDueAt: c.nextDueAt,
      limitedRange: c.limitedMin != null && c.limitedMax != null ? { min: fromDb(c.limitedMin), max: fromDb(c.limitedMax), note: c.limitedNote } : null,
      notes: c.notes,
      supersedesId: c.supersedesId,
      supersedeReason: c.supersedeReason,
      supersededById: rel.successors.find((s) => s.supersedesId === c.id)?.id ?? null,
      standards: rel.standards.filter((s) => s.calibrationId === c.id).map((s) => ({ id: s.id, assetTag: s.assetTag, name: s.name })),
      points,
      turWarning: points.some((p) => p.turAdequate === false),
      review: review
        ? {
            id: review.review.id,
            reviewedBy: review.review.reviewedBy ? { id: review.review.reviewedBy, name: review.reviewerName ?? "" } : null,
            reviewedAt: review.review.reviewedAt.toISOString(),
            accepted: review.review.accepted,
            findings: review.review.findings,
          }
        : null,
      awaitingReview: c.source === "outside_lab" && !review,
      createdAt: c.createdAt.toISOString(),
    };
  });
}

export function calibrationsService(deps: RegisterDeps) {
  const { db, clock, defaultTimeZone } = deps;

  async function getRow(id: string) {
    const row = await calibrationsRepository.findById(db, id);
    if (!row) throw notFound("calibration", id);
    return row;
  }

  async function one(id: string, extra: Partial<Calibration> = {}): Promise<Calibration> {
    const row = await getRow(id);
    const tool = (await toolsRepository.findById(db, row.toolId))!;
    const [out] = await toCalibrations(db, [row], tool);
    return { ...out, ...extra };
  }

  /** Each named standard with the certificate covering the calibration date; 409 standard_not_in_calibration naming those with none. */
  async function standardsInCalibration(tx: DbOrTx, standardIds: string[], date: string) {
    const unique = [...new Set(standardIds)];
    const rows = await standardsRepository.findByIds(tx, unique);
    for (const id of unique) if (!rows.some((r) => r.id === id)) throw unknownReference("standard", id);
    const covering = await standardsRepository.coveringCertificates(tx, unique, date);
    const out = unique.map((id) => ({ standard: rows.find((r) => r.id === id)!, certificate: covering.get(id) ?? null }));
    const lapsed = out.filter((s) => !s.certificate);
    if (lapsed.length) {
      const all = await standardsRepository.certificatesOf(tx, lapsed.map((s) => s.standard.id));
      // Ran out: the last certificate that ended before the date. Otherwise none covers it (none yet, or all issued later).
      const details = lapsed.map((s) => {
        const ranOut = all.find((c) => c.standardId === s.standard.id && c.dueAt < date)?.dueAt ?? null;
        return { assetTag: s.standard.assetTag, reason: ranOut ? ("certificate_ran_out" as const) : ("no_certificate_covers" as const), dueAt: ranOut };
      });
      const why = details.map((d) => (d.dueAt ? `the certificate of ${d.assetTag} ran out ${d.dueAt}` : `no certificate of ${d.assetTag} covers ${date}`)).join("; ");
      throw refused(
        "standard_not_in_calibration",
        `${why[0].toUpperCase()}${why.slice(1)}; use a standard in calibration on ${date}.`,
        details,
      );
    }
    return out as { standard: StandardRow; certificate: CertificateRow }[];
  }

  return {
    one,

    async listForTool(assetTag: string, query: CalibrationListQuery): Promise<Page<Calibration>> {
      const tool = await getToolRow(db, assetTag);
      const { items, total } = await calibrationsRepository.listForTool(db, tool.id, query);
      return { items: await toCalibrations(db, items, tool), total };
    },

    /**
     * Signs a calibration: every point judged with the shared decision rules,
     * the result and the next due date computed, the standards checked for
     * being in calibration on the day. An as-found failure opens its
     * investigation in the same transaction. Nothing is written when refused.
     */
    async create(assetTag: string, input: CreateCalibration, actorId: string | null): Promise<Calibration> {
      const tool = await getToolRow(db, assetTag);
      const now = clock.now();
      const performedAt = new Date(input.performedAt);
      if (performedAt.getTime() > now.getTime()) throw new AppError("performed_in_future", 400, "A calibration cannot be recorded before it is performed; check the date and time.");
      if (tool.lifecycle === "retired") throw refused("tool_retired", `${tool.assetTag} is retired; it is not calibrated any more.`);
      const { timeZone } = await statusContext(db, defaultTimeZone);
      const settings = await getSettings(db, defaultTimeZone);
      const family = await getFamilyRow(db, tool.familyId);
      const day = calendarDate(performedAt, timeZone);

      if (input.supersedesId) {
        const old = await calibrationsRepository.findById(db, input.supersedesId);
        if (!old || old.toolId !== tool.id) throw unknownReference("calibration", input.supersedesId);
        if (await calibrationsRepository.supersededBy(db, old.id)) throw refused("already_superseded", "That record has already been corrected; correct the latest record instead.");
      }
      if (input.labId && !(await labsRepository.findById(db, input.labId))) throw unknownReference("lab", input.labId);
      if (input.certificateFileKey && !deps.storage) throw new AppError("storage_unavailable", 503, "File storage is not available.");
      const elementIds = [...new Set(input.points.map((p) => p.elementId).filter((x): x is string => !!x))];
      for (const id of elementIds) if (!(await toolsRepository.findElement(db, tool.id, id))) throw unknownReference("element", id);
      const used = await standardsInCalibration(db, input.standardIds, day);

      let computed;
      try {
        computed = computeCalibration({
          rule: input.decisionRule,
          guardBandMultiplier: settings.guardBandMultiplier,
          adjusted: input.adjusted ?? null,
          unit: tool.unit,
          resolution: fromDb(tool.resolution),
          temperatureC: input.temperatureC ?? null,
          temperatureVariationC: input.temperatureVariationC ?? null,
          otherUncertainties: input.otherUncertainties,
          familyMpe: family.mpe,
          checkPlan: family.checkPoints,
          standards: used.map(standardForCompute),
          limitedRange: input.limitedRange ? { min: input.limitedRange.min, max: input.limitedRange.max } : null,
          points: input.points,
        });
      } catch (e) {
        if (e instanceof DecisionRuleError) throw new AppError(e.code, 400, e.message);
        throw e;
      }
      const due = nextDueAt({ performedAt: input.performedAt, intervalDays: tool.intervalDays, timeZone });

      const { id, investigationId } = await db.transaction(async (tx) => {
        const row = await calibrationsRepository.insert(
          tx,
          {
            toolId: tool.id,
            performedAt,
            performedBy: input.source === "in_house" ? actorId : null,
            performedByName: input.performedByName ?? null,
            source: input.source,
            labId: input.labId ?? null,
            certificateNumber: input.certificateNumber ?? null,
            certificateFileKey: input.certificateFileKey ?? null,
            temperatureC: toDbOrNull(input.temperatureC),
            temperatureVariationC: toDbOrNull(input.temperatureVariationC),
            humidityPct: toDbOrNull(input.humidityPct),
            decisionRule: input.decisionRule,
            guardBandMultiplier: toDb(input.decisionRule === "simple" ? 0 : input.decisionRule === "guarded" ? 1 : settings.guardBandMultiplier),
            adjusted: computed.adjusted,
            result: computed.result,
            asFoundInTolerance: computed.asFoundInTolerance,
            asFoundStatement: computed.asFoundStatement,
            otherUncertainties: input.otherUncertainties?.length ? input.otherUncertainties : null,
            intervalDays: tool.intervalDays,
            nextDueAt: due,
            limitedMin: toDbOrNull(input.limitedRange?.min),
            limitedMax: toDbOrNull(input.limitedRange?.max),
            limitedNote: input.limitedRange?.note ?? null,
            notes: input.notes ?? null,
            supersedesId: input.supersedesId ?? null,
            supersedeReason: input.supersedeReason ?? null,
          },
          computed.points.map((p) => ({
            seq: p.seq,
            elementId: p.elementId,
            nominal: toDb(p.nominal),
            reference: toDb(p.reference),
            asFound: toDb(p.asFound),
            asLeft: toDbOrNull(p.asLeft),
            errorAsFound: toDb(p.errorAsFound),
            errorAsLeft: toDbOrNull(p.errorAsLeft),
            mpe: toDb(p.mpe),
            uncertainty: toDbOrNull(p.uncertainty),
            guardBand: toDb(p.guardBand),
            acceptanceLimit: toDb(p.acceptanceLimit),
            tur: p.tur == null ? null : toDb(Number(p.tur.toPrecision(6))),
            asFoundInTolerance: p.asFoundInTolerance,
            asFoundStatement: p.asFoundStatement,
            verdict: p.verdict,
            releasedOn: p.releasedOn,
            repeatReadings: p.repeatReadings ? p.repeatReadings.map((r) => toDb(r)) : null,
            referenceParts: p.referenceParts.length ? p.referenceParts : null,
            budget: p.budget,
          })),
          used.map((u) => u.standard.id),
        );
        // The certificate file must be one the upload route issued for a calibration, named by no other record.
        if (input.certificateFileKey) await claimStoredFile(tx, input.certificateFileKey, "calibration_certificate", `calibration:${row.id}`, clock.now());
        await recordAudit(tx, {
          actorId,
          action: input.supersedesId ? "calibration.supersede" : "calibration.create",
          entityType: "calibration",
          entityId: row.id,
          before: input.supersedesId ? { supersedesId: input.supersedesId } : undefined,
          after: { assetTag: tool.assetTag, ...input, result: computed.result, adjusted: computed.adjusted, asFoundInTolerance: computed.asFoundInTolerance, asFoundStatement: computed.asFoundStatement, nextDueAt: due },
          at: now,
        });
        // Found out of tolerance as found (the error against ± MPE, ILAC-G8 simple acceptance): the work measured since the last
        // good calibration is in question. A refusal to release inside the guard band, or a conditional pass, opens nothing:
        // conditional statements are listed for the quality manager's review instead.
        const opened = computed.asFoundInTolerance
          ? null
          : await onOutOfToleranceFinding(tx, { clock, mailer: deps.mailer, logger: deps.logger, timeZone }, { kind: "as_found_failure", toolId: tool.id, calibrationId: row.id, at: performedAt, actorId });
        return { id: row.id, investigationId: opened?.investigationId ?? null };
      }).catch((e: unknown) => {
        // Simultaneous corrections of one record: the unique index lets exactly one through.
        if (isUniqueViolation(e, "calibrations_one_correction_each")) throw refused("already_superseded", "That record has just been corrected by someone else; correct the latest record instead.");
        throw e;
      });
      return one(id, { investigationId });
    },

    /** As-found points within U of a limit (ILAC-G8 conditional statements), for the quality manager's review. */
    async conditionalResults(query: ConditionalResultsQuery): Promise<Page<ConditionalResult>> {
      const { items, total } = await calibrationsRepository.conditionalResults(db, query);
      return {
        total,
        items: items.map((r) => ({
          calibrationId: r.calibration_id,
          pointId: r.point_id,
          assetTag: r.asset_tag,
          toolDescription: r.description,
          unit: r.unit,
          performedAt: new Date(r.performed_at).toISOString(),
          seq: Number(r.seq),
          nominal: fromDb(r.nominal),
          elementLabel: r.element,
          errorAsFound: fromDb(r.error_as_found),
          mpe: fromDb(r.mpe),
          uncertainty: fromDbOrNull(r.uncertainty),
          asFoundStatement: r.as_found_statement,
          result: r.result,
        })),
      };
    },

    /** The signed record as a PDF: points, statements, release decision and each point's uncertainty budget. */
    async recordPdf(id: string) {
      const row = await getRow(id);
      const tool = await toolsRepository.findById(db, row.toolId);
      if (!tool) throw notFound("tool", row.toolId);
      const [cal] = await toCalibrations(db, [row], tool);
      const { timeZone } = await statusContext(db, defaultTimeZone);
      return { pdf: await writeCalibrationPdf(cal, { description: tool.description, serialNumber: tool.serialNumber }, clock.now(), timeZone), fileName: `calibration-${tool.assetTag}-${cal.performedAt.slice(0, 10)}.pdf` };
    },

    async review(id: string, input: CertificateReview, actorId: string | null): Promise<Calibration> {
      const row = await getRow(id);
      if (row.source !== "outside_lab") throw refused("not_outside_lab", "Only an outside lab's certificate is reviewed; in-house records count when signed.");
      await db.transaction(async (tx) => {
        if (await calibrationsRepository.reviewOf(tx, id)) throw refused("already_reviewed", "This certificate has been reviewed already; record a correcting calibration if the review was wrong.");
        const review = await calibrationsRepository.insertReview(tx, { calibrationId: id, reviewedBy: actorId, reviewedAt: clock.now(), accepted: input.accepted, findings: input.findings });
        await recordAudit(tx, { actorId, action: "calibration.review", entityType: "calibration", entityId: id, after: review, at: clock.now() });
      }).catch((e: unknown) => {
        if (isUniqueViolation(e, "calibration_reviews_one_per_calibration")) throw refused("already_reviewed", "This certificate was reviewed a moment ago by someone else.");
        throw e;
      });
      return one(id);
    },

    async uploadCertificate(file: { buffer: Buffer; fileName: string; contentType: string; size: number }, actorId: string | null): Promise<UploadedFile> {
      if (!deps.storage) throw new AppError("storage_unavailable", 503, "File storage is not available.");
      const key = await deps.storage.put("calibration-certificates", file.buffer, file.contentType, file.fileName);
      await db.transaction(async (tx) => {
        await recordStoredFile(tx, { key, purpose: "calibration_certificate", contentType: file.contentType, size: file.size, fileName: file.fileName, uploadedBy: actorId, uploadedAt: clock.now() });
        await recordAudit(tx, { actorId, action: "calibration.certificate.upload", entityType: "file", entityId: key, after: { fileName: file.fileName, size: file.size }, at: clock.now() });
      });
      return { fileKey: key, fileName: file.fileName, contentType: file.contentType, size: file.size };
    },

    async certificateFile(id: string) {
      const row = await getRow(id);
      if (!row.certificateFileKey) throw notFound("certificate file", id);
      return { key: row.certificateFileKey, fileName: `calibration-certificate-${row.certificateNumber ?? row.id}` };
    },

    /** Signed records are never changed: the answer to any edit or deletion. */
    async refuseChange(id: string): Promise<never> {
      await getRow(id);
      throw refused("record_signed", "A signed calibration is never changed or deleted; record a correction that supersedes it, with the reason.");
    },

    /** Traceability: tool → calibration → standards → the certificate covering that date → lab and accreditation → national institute. */
    async chain(assetTag: string, calibrationId?: string): Promise<Chain> {
      const tool = await getToolRow(db, assetTag);
      const now = clock.now();
      const { today, warnDays, timeZone } = await shopToday(db, defaultTimeZone, now);
      let cal: CalibrationRow | undefined;
      if (calibrationId) {
        cal = await calibrationsRepository.findById(db, calibrationId);
        if (!cal || cal.toolId !== tool.id) throw notFound("calibration", calibrationId);
      } else {
        const counting = (await statusOf(db, tool.id, now, { timeZone, dueSoonDays: warnDays })).lastCalibration;
        cal = counting ? await calibrationsRepository.findById(db, counting.id) : await calibrationsRepository.latestForTool(db, tool.id);
      }
      const gaps: string[] = [];
      const labView = async (labId: string | null) => {
        if (!labId) return null;
        const l = await labsRepository.findById(db, labId);
        return l ? (({ createdAt: _c, contact: _k, ...rest }) => rest)(toLab(l, today, warnDays)) : null;
      };
      const toolPart = { assetTag: tool.assetTag, description: tool.description, serialNumber: tool.serialNumber, unit: tool.unit };
      if (!cal) return { tool: toolPart, calibration: null, standards: [], gaps: [`${tool.assetTag} has no calibration on record.`] };

      const day = calendarDate(cal.performedAt, timeZone);
      const calLab = await labView(cal.labId);
      if (cal.source === "outside_lab" && calLab && calLab.accreditation === "expired") gaps.push(`${calLab.name}'s accreditation has expired.`);
      const standardIds = await calibrationsRepository.standardIdsOf(db, cal.id);
      if (standardIds.length === 0 && cal.source === "in_house") gaps.push("The calibration names no reference standard.");
      const covering = await standardsRepository.coveringCertificates(db, standardIds, day);
      const standards = [];
      for (const sid of standardIds) {
        const s = await getStandardRow(db, sid);
        const c = covering.get(sid) ?? null;
        if (!c) gaps.push(`${s.assetTag} had no certificate covering ${day}.`);
        else if (!c.nationalInstitute) gaps.push(`${s.assetTag}'s certificate ${c.number} names no national measurement institute.`);
        standards.push({
          id: s.id,
          assetTag: s.assetTag,
          name: s.name,
          kind: s.kind,
          unit: s.unit,
          certificate: c
            ? {
                id: c.id,
                number: c.number,
                labName: c.labName,
                issuedAt: c.issuedAt,
                dueAt: c.dueAt,
                expandedUncertainty: fromDb(c.expandedUncertainty),
                coverageFactor: fromDb(c.coverageFactor),
                accreditationBody: c.accreditationBody,
                scope: c.scope,
                nationalInstitute: c.nationalInstitute,
                hasFile: !!c.fileKey,
                fileUrl: certificateFileUrl(c),
                lab: await labView(c.labId),
              }
            : null,
        });
      }
      return {
        tool: toolPart,
        calibration: {
          id: cal.id,
          performedAt: cal.performedAt.toISOString(),
          result: cal.result,
          source: cal.source,
          certificateNumber: cal.certificateNumber,
          nextDueAt: cal.nextDueAt,
          lab: calLab,
          hasCertificateFile: !!cal.certificateFileKey,
          certificateFileUrl: calibrationCertificateUrl(cal),
        },
        standards,
        gaps,
      };
    },
  };
}
