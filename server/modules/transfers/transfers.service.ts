import Papa from "papaparse";
import type { Writable } from "node:stream";
import type { Db } from "../../db/client";
import type { Clock } from "../../platform/clock";
import { AppError } from "../../http/errors";
import { transfersRepository } from "./transfers.repository";
import { recordAudit, recordAuditMany } from "../audit/audit.repository";
import { getSettings } from "../settings/settings.service";
import { statusContext, statusesFor } from "../tools/tool-status.service";
import { checkRows, missingFields, proposeMapping, localNoon, rowNumber, type ImportCheck } from "../../../shared/transfers/register-import";
import { IMPORTED_CALIBRATION_NOTE, type CommitResult, type DryRunResult, type ImportError, type ImportMapping } from "../../../shared/transfers/transfers.schemas";
import { nextDueAt } from "../../../shared/calibrations/due-dates";
import { STATUS_LABELS } from "../../../shared/tools/tool-status";

/** The most rows one import takes (a large shop's register fits many times over). */
export const MAX_IMPORT_ROWS = 100_000;
const LISTED_ERRORS = 1000;

export type Progress = (p: { done: number; total: number; phase: "validating" | "importing" }) => void;

/** The file's text: UTF-8 only (a spreadsheet's "CSV UTF-8" export); a byte-order mark is dropped. */
export function decodeCsv(buf: Buffer): string {
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(buf).replace(/^\uFEFF/, "");
  } catch {
    throw new AppError(
      "csv_not_utf8",
      400,
      "The file is not UTF-8 text. Save it from your spreadsheet as “CSV UTF-8” (or export it as UTF-8) and upload it again; nothing was imported.",
    );
  }
}

interface Parsed {
  columns: string[];
  records: Record<string, string>[];
  malformed: ImportError[];
}

function parseCsv(text: string): Parsed {
  if (!text.trim()) throw new AppError("csv_empty", 400, "The file is empty: it needs a header row and at least one row of tools.");
  const res = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: "greedy", transformHeader: (h) => h.trim() });
  const columns = (res.meta.fields ?? []).filter((c) => c !== "");
  if (!columns.length) throw new AppError("csv_no_header", 400, "The first row of the file must name the columns.");
  if (res.data.length > MAX_IMPORT_ROWS) throw new AppError("csv_too_many_rows", 400, `The file has ${res.data.length} rows; import at most ${MAX_IMPORT_ROWS} at a time.`);
  const malformed: ImportError[] = res.errors
    .filter((e) => e.row !== undefined && e.row !== null)
    .map((e) => ({ row: rowNumber(e.row as number), field: null, column: null, code: "malformed_row", message: e.code === "TooFewFields" || e.code === "TooManyFields" ? `${e.message}; check for a missing or extra comma.` : e.message }));
  return { columns, records: res.data, malformed };
}

export function transfersService({ db, clock, timeZone }: { db: Db; clock: Clock; timeZone: string }) {
  async function check(text: string, mappingIn: ImportMapping | undefined, createMissingFamilies: boolean, progress?: Progress) {
    const { columns, records, malformed } = parseCsv(text);
    const mapping = mappingIn ?? proposeMapping(columns);
    const unknownColumns = Object.entries(mapping).filter(([, col]) => !columns.includes(col as string));
    const missing = missingFields(mapping, columns);
    const tagCol = mapping.assetTag;
    const tags = tagCol && columns.includes(tagCol) ? records.map((r) => (r[tagCol] ?? "").trim()).filter(Boolean) : [];
    const [existingTags, fams] = await Promise.all([transfersRepository.existingTags(db, tags), transfersRepository.allFamilies(db)]);
    const families = new Map(fams.map((f) => [f.name.toLowerCase(), f]));
    const total = records.length;
    progress?.({ done: 0, total, phase: "validating" });
    const checked: ImportCheck = missing.length
      ? { valid: [], errors: [], familiesToCreate: new Map() }
      : checkRows(records, mapping, { existingTags, families, createMissingFamilies }, (done) => progress?.({ done, total, phase: "validating" }));
    const headerErrors: ImportError[] = [
      ...missing.map((f) => ({ row: 1, field: f, column: null, code: "missing_column", message: `No column of the file is mapped to ${f}; map one (the header row names the columns).` })),
      ...unknownColumns.map(([f, col]) => ({ row: 1, field: f, column: String(col), code: "unknown_column", message: `The file has no column "${col}".` })),
    ];
    const errors = [...headerErrors, ...malformed, ...checked.errors].sort((a, b) => a.row - b.row);
    return { columns, records, mapping, missing, errors, checked };
  }

  function summary(c: Awaited<ReturnType<typeof check>>): DryRunResult {
    return {
      columns: c.columns,
      mapping: c.mapping,
      missingFields: c.missing,
      rows: c.records.length,
      validRows: c.missing.length ? 0 : c.checked.valid.length,
      errorCount: c.errors.length,
      errors: c.errors.slice(0, LISTED_ERRORS),
      familiesToCreate: [...c.checked.familiesToCreate.values()].map((f) => f.name),
      calibrationsToImport: c.checked.valid.filter((v) => v.value.lastCalibratedAt).length,
      preview: c.records.slice(0, 10).map((r) => Object.fromEntries(c.columns.map((col) => [col, r[col] ?? null]))),
    };
  }

  return {
    /** Checks every row and proposes a mapping; writes nothing. */
    async dryRun(text: string, mapping: ImportMapping | undefined, createMissingFamilies: boolean, progress?: Progress): Promise<DryRunResult> {
      return summary(await check(text, mapping, createMissingFamilies, progress));
    },

    /**
     * Imports every row in one transaction, or nothing: any row error refuses the
     * whole file. Last calibration dates become calibration records marked as
     * imported history, due by the shared rule.
     */
    async commit(text: string, mapping: ImportMapping | undefined, createMissingFamilies: boolean, actorId: string, progress?: Progress): Promise<CommitResult> {
      const c = await check(text, mapping, createMissingFamilies, progress);
      if (c.errors.length) {
        throw new AppError("import_rows_invalid", 400, `${c.errors.length} problem${c.errors.length === 1 ? "" : "s"} in the file (see the rows listed); nothing was imported.`, {
          errors: c.errors.slice(0, LISTED_ERRORS),
          errorCount: c.errors.length,
        });
      }
      const { shopTimeZone } = await getSettings(db, timeZone);
      const now = clock.now();
      const rows = c.checked.valid;
      const total = rows.length;
      return db.transaction(async (tx) => {
        const created = await transfersRepository.insertFamilies(
          tx,
          [...c.checked.familiesToCreate.values()].map((f) => ({ name: f.name, kind: f.kind, unit: f.unit, defaultIntervalDays: f.defaultIntervalDays })),
        );
        const familyIds = new Map<string, string>();
        (await transfersRepository.allFamilies(tx)).forEach((f) => familyIds.set(f.name.toLowerCase(), f.id));
        const inserted = await transfersRepository.insertTools(
          tx,
          rows.map(({ value: v, intervalDays, familyKey }) => ({
            assetTag: v.assetTag,
            familyId: familyIds.get(familyKey)!,
            description: v.description,
            serialNumber: v.serialNumber,
            unit: v.unit,
            rangeMin: v.rangeMin,
            rangeMax: v.rangeMax,
            resolution: v.resolution,
            intervalDays,
            maker: v.maker ?? null,
            model: v.model ?? null,
            location: v.location ?? null,
          })),
          (n) => progress?.({ done: Math.floor(n / 2), total, phase: "importing" }),
        );
        const toolIds = new Map(inserted.map((t) => [t.assetTag, t.id]));
        const history = rows.filter((r) => r.value.lastCalibratedAt);
        const cals = await transfersRepository.insertCalibrations(
          tx,
          history.map(({ value: v, intervalDays }) => {
            const performedAt = localNoon(v.lastCalibratedAt!, shopTimeZone);
            return {
              toolId: toolIds.get(v.assetTag)!,
              performedAt,
              performedBy: null,
              performedByName: "previous register (imported)",
              source: "in_house" as const,
              decisionRule: "simple" as const,
              result: "pass" as const,
              // The previous register recorded a date, not the as-found readings; interval analysis leaves these out.
              asFoundInTolerance: true,
              intervalDays,
              nextDueAt: nextDueAt({ performedAt: performedAt.toISOString(), intervalDays, timeZone: shopTimeZone }),
              notes: IMPORTED_CALIBRATION_NOTE,
            };
          }),
          (n) => progress?.({ done: Math.floor(total / 2 + (n / Math.max(1, history.length)) * (total / 2)), total, phase: "importing" }),
        );
        await recordAuditMany(tx, [
          ...created.map((f) => ({ actorId, action: "family.import", entityType: "family", entityId: f.id, after: { name: f.name }, at: now })),
          ...inserted.map((t) => ({ actorId, action: "tool.import", entityType: "tool", entityId: t.assetTag, after: { assetTag: t.assetTag, source: "CSV import" }, at: now })),
          ...cals.map((k) => ({ actorId, action: "calibration.import", entityType: "calibration", entityId: k.id, after: { toolId: k.toolId, notes: IMPORTED_CALIBRATION_NOTE }, at: now })),
        ]);
        const result = { tools: inserted.length, familiesCreated: created.length, calibrations: cals.length };
        await recordAudit(tx, { actorId, action: "register.import", entityType: "import", entityId: now.toISOString(), after: { ...result, mapping: c.mapping, rows: c.records.length }, at: now });
        progress?.({ done: total, total, phase: "importing" });
        return result;
      });
    },

    /** Streams the register as CSV: every tool with its derived status now and its last calibration. */
    async exportRegister(out: Writable) {
      const ctx = await statusContext(db, timeZone);
      const at = clock.now();
      let after: string | null = null;
      let first = true;
      for (;;) {
        const page = await transfersRepository.toolsAfter(db, after, 2000);
        if (!page.length) break;
        const statuses = await statusesFor(db, page.map((t) => t.id), at, ctx);
        const rows = page.map(({ id, ...t }) => {
          const s = statuses.get(id)!;
          return {
            ...t,
            status: s.status,
            statusLabel: STATUS_LABELS[s.status],
            usable: s.usable ? "yes" : "no",
            dueAt: s.dueAt ?? "",
            custodian: s.custodian?.name ?? "",
            lastCalibratedAt: s.lastCalibration?.performedAt ?? "",
            lastResult: s.lastCalibration?.result ?? "",
          };
        });
        out.write(toCsv(rows, first));
        first = false;
        after = page[page.length - 1].assetTag;
      }
      if (first) out.write(REGISTER_HEADER + "\r\n");
      out.end();
    },

    /** Streams every calibration record with its points (one line per point), oldest first, superseded records included and marked. */
    async exportHistory(out: Writable) {
      let after: { at: Date; id: string } | null = null;
      let first = true;
      for (;;) {
        const page = await transfersRepository.calibrationsAfter(db, after, 1000);
        if (!page.length) break;
        const points = await transfersRepository.pointsOf(db, page.map((c) => c.id));
        const byCal = new Map<string, typeof points>();
        points.forEach((p) => byCal.set(String(p.calibration_id), [...(byCal.get(String(p.calibration_id)) ?? []), p]));
        const rows = page.flatMap((c) => {
          const base = { ...c, calibrationId: c.id, performedAt: c.performedAt.toISOString(), asFoundInTolerance: c.asFoundInTolerance ? "yes" : "no" };
          delete (base as Partial<typeof base>).id;
          const pts = byCal.get(c.id) ?? [];
          const empty = { seq: "", element: "", nominal: "", reference: "", asFound: "", asLeft: "", errorAsFound: "", errorAsLeft: "", mpe: "", uncertainty: "", tur: "", verdict: "" };
          if (!pts.length) return [{ ...base, ...empty }];
          return pts.map((p) => ({
            ...base,
            seq: p.seq,
            element: p.element ?? "",
            nominal: p.nominal,
            reference: p.reference,
            asFound: p.as_found,
            asLeft: p.as_left ?? "",
            errorAsFound: p.error_as_found,
            errorAsLeft: p.error_as_left ?? "",
            mpe: p.mpe,
            uncertainty: p.uncertainty ?? "",
            tur: p.tur ?? "",
            verdict: p.verdict,
          }));
        });
        out.write(toCsv(rows, first));
        first = false;
        const last = page[page.length - 1];
        after = { at: last.performedAt, id: last.id };
      }
      if (first) out.write(HISTORY_HEADER + "\r\n");
      out.end();
    },
  };
}

const REGISTER_HEADER =
  "assetTag,description,family,serialNumber,maker,model,unit,rangeMin,rangeMax,resolution,intervalDays,location,ownerType,ownerName,status,statusLabel,usable,dueAt,custodian,lastCalibratedAt,lastResult";
const HISTORY_HEADER =
  "performedAt,assetTag,source,lab,certificateNumber,performedBy,temperatureC,decisionRule,result,asFoundInTolerance,intervalDays,nextDueAt,supersedesId,supersedeReason,notes,calibrationId,seq,element,nominal,reference,asFound,asLeft,errorAsFound,errorAsLeft,mpe,uncertainty,tur,verdict";

// A cell a spreadsheet would run as a formula is quoted with a leading apostrophe; negative numbers stay numbers.
const FORMULA = /^([=+@\t\r]|-(?![\d.]))/;

/** Rows as CSV text (CRLF lines, RFC 4180 quoting), with the header on the first chunk only. */
export function toCsv(rows: Record<string, unknown>[], header: boolean): string {
  if (!rows.length) return "";
  const text = Papa.unparse(rows, { header, newline: "\r\n", escapeFormulae: FORMULA });
  return text + "\r\n";
}
