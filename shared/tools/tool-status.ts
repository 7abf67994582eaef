// The one status derivation, shared by server and client (product.md, "Tool status").
import { calendarDate, daysBetween } from "../common/dates";
import { dec } from "../common/decimal";

// The names and labels live in status-labels.ts, so a page that only shows a status does not load the derivation.
import type { ToolStatus } from "./status-labels";
export { TOOL_STATUSES, STATUS_LABELS, type ToolStatus } from "./status-labels";

export interface ToolStatusInput {
  at: string; // ISO instant the question is asked for
  timeZone: string; // shop time zone
  dueSoonDays: number; // warning window, e.g. 30
  tool: { calibrationRequired: boolean; lifecycle: "active" | "inactive" | "lost" | "retired"; usageLimit: number | null };
  lastCalibration: null | {
    // latest non-superseded calibration performed at or before `at` that counts (in-house, or outside-lab with review recorded)
    performedAt: string;
    result: "pass" | "adjusted" | "fail" | "limited";
    nextDueAt: string;
    limitedRange?: { min: number; max: number; unit: "in" | "mm"; note?: string | null } | null;
  };
  pendingReview: null | { performedAt: string; lab: string }; // outside-lab record received but certificate not yet reviewed
  usesSinceCalibration: number; // check-outs since lastCalibration
  failedCheckSinceCalibration: null | { performedAt: string; deviation: number }; // intermediate check failed after lastCalibration
  hold: null | { reason: string; since: string }; // open quarantine
  atLab: null | { since: string; lab: string; expectedBackAt: string | null };
}

export interface ToolStatusResult {
  status: ToolStatus;
  usable: boolean;
  usableForAcceptance: boolean;
  reasons: string[];
  dueAt: string | null;
  daysToDue: number | null;
  usesRemaining: number | null;
}

const USABLE: ReadonlySet<ToolStatus> = new Set(["in_calibration", "due_soon", "limited", "reference_only"]);

/** True for statuses under which the tool may be used to measure (reference_only: not for acceptance readings). */
export function isUsableStatus(s: ToolStatus): boolean {
  return USABLE.has(s);
}

/** True for statuses under which the tool may take acceptance readings (limited: inside its stated range only). */
export function isUsableForAcceptanceStatus(s: ToolStatus): boolean {
  return USABLE.has(s) && s !== "reference_only";
}

/** Derive a tool's status at an instant from its lifecycle, custody, holds and calibration history; first rule that applies wins. */
export function deriveToolStatus(input: ToolStatusInput): ToolStatusResult {
  const { at, timeZone, tool } = input;
  const atMs = Date.parse(at);
  if (Number.isNaN(atMs)) throw new RangeError(`Not an instant: ${at}`);
  // Events recorded after the instant asked about did not exist then (a status can be asked for a past instant).
  const happened = <T extends object>(event: T | null, when: (e: T) => string): T | null =>
    event && Date.parse(when(event)) <= atMs ? event : null;
  const cal = happened(input.lastCalibration, (c) => c.performedAt);
  const pending = happened(input.pendingReview, (p) => p.performedAt);
  const checked = happened(input.failedCheckSinceCalibration, (f) => f.performedAt);
  // A failed check made before the latest calibration was cleared by that calibration.
  const failedCheck = checked && (!cal || Date.parse(checked.performedAt) >= Date.parse(cal.performedAt)) ? checked : null;
  const hold = happened(input.hold, (h) => h.since);
  const atLab = happened(input.atLab, (l) => l.since);

  const today = calendarDate(at, timeZone);
  const day = (instant: string) => calendarDate(instant, timeZone);
  const dueAt = cal?.nextDueAt ?? null;
  const daysToDue = dueAt ? daysBetween(today, dueAt) : null;
  const limit = tool.usageLimit;
  const usesRemaining = limit != null && cal ? Math.max(0, limit - input.usesSinceCalibration) : null;
  const pendingNote = pending
    ? [`Certificate from ${pending.lab} (calibrated ${day(pending.performedAt)}) awaiting review; the tool returns to service once the review is recorded.`]
    : [];

  const result = (status: ToolStatus, reasons: string[]): ToolStatusResult => ({
    status,
    usable: isUsableStatus(status),
    usableForAcceptance: isUsableForAcceptanceStatus(status),
    reasons: [...reasons, ...(status === "never_calibrated" ? [] : pendingNote)],
    dueAt,
    daysToDue,
    usesRemaining,
  });

  if (tool.lifecycle === "retired") return result("retired", ["Retired from service; do not use for measuring."]);
  if (tool.lifecycle === "lost") return result("lost", ["Reported lost; do not use until found, checked and recalibrated."]);
  if (atLab) {
    const back = atLab.expectedBackAt ? ` Expected back ${atLab.expectedBackAt.slice(0, 10)}.` : "";
    return result("at_calibration", [`Away at ${atLab.lab} for calibration since ${day(atLab.since)}; not available.${back}`]);
  }
  if (hold) return result("quarantined", [`Quarantined since ${day(hold.since)}: ${hold.reason}`]);
  if (failedCheck) {
    return result("out_of_tolerance", [
      `Failed an intermediate check on ${day(failedCheck.performedAt)} (off by ${signed(failedCheck.deviation)}); do not use until recalibrated.`,
    ]);
  }
  if (cal?.result === "fail") {
    return result("out_of_tolerance", [
      `Found out of tolerance at calibration on ${day(cal.performedAt)}; do not use until repaired and recalibrated.`,
    ]);
  }
  if (tool.lifecycle === "inactive") return result("inactive", ["Stored as inactive; calibrate before returning it to use."]);
  if (!tool.calibrationRequired) {
    return result("reference_only", ["No calibration required: for reference only, never for acceptance readings."]);
  }
  if (!cal) return result("never_calibrated", ["No calibration on record; do not use until calibrated.", ...pendingNote]);

  const overdueReasons: string[] = [];
  if (today > cal.nextDueAt) overdueReasons.push(`Calibration ran out on ${cal.nextDueAt}; do not use until recalibrated.`);
  if (limit != null && input.usesSinceCalibration >= limit) {
    overdueReasons.push(`Usage limit reached: ${input.usesSinceCalibration} of ${limit} uses since calibration; recalibrate before further use.`);
  }
  if (overdueReasons.length > 0) return result("overdue", overdueReasons);

  const dueSoonReasons: string[] = [];
  if (daysToDue! <= input.dueSoonDays) {
    dueSoonReasons.push(
      daysToDue === 0
        ? `Calibration runs out today (${cal.nextDueAt}); usable until the end of the day.`
        : `Calibration runs out on ${cal.nextDueAt} (in ${daysToDue} day${daysToDue === 1 ? "" : "s"}); plan recalibration.`,
    );
  }
  // Warn in the last tenth of a usage limit (common practice, no source).
  if (limit != null && usesRemaining! * 10 <= limit) {
    dueSoonReasons.push(`Only ${usesRemaining} use${usesRemaining === 1 ? "" : "s"} left of ${limit} before recalibration is due.`);
  }

  if (cal.result === "limited") {
    const r = cal.limitedRange;
    const range = r
      ? `Limited use: only within ${r.min}–${r.max} ${r.unit}.${r.note ? ` ${r.note}` : ""}`
      : "Limited use: only within the range stated on the calibration record.";
    return result("limited", [range, ...dueSoonReasons]);
  }
  if (dueSoonReasons.length > 0) return result("due_soon", dueSoonReasons);
  return result("in_calibration", [`In calibration until ${cal.nextDueAt}.`]);
}

function signed(n: number): string {
  const d = dec(n);
  return d.isPositive() && !d.isZero() ? `+${d.toString()}` : d.toString();
}
