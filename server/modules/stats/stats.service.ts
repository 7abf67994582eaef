import type { Db } from "../../db/client";
import type { Clock } from "../../platform/clock";
import type { Logger } from "pino";
import { statsRepository } from "./stats.repository";
import { intervalsRepository } from "../intervals/intervals.repository";
import { gatherStatusesAt, statusContext, statusesOfRows, type StatusContext, type ToolStatusView } from "../tools/tool-status.service";
import { countByStatus, eventsAfter, foldToolStateCounts, foldWanted, statusNow } from "../tools/tool-states.sql";
import { TOOL_STATUSES, type ToolStatus } from "../../../shared/tools/tool-status";
import { addDays, calendarDate } from "../../../shared/common/dates";
import type { StatsDashboard, StatsInspection, StatsMine, StatsOverview } from "../../../shared/stats/stats.schemas";

/** Tools per status query; keeps each query's parameter list well inside PostgreSQL's limit. */
const CHUNK = 5000;

/** Statuses under which a tool is still in calibration, so its due date is ahead of it. */
const IN_CALIBRATION: ReadonlySet<ToolStatus> = new Set(["in_calibration", "due_soon", "limited"]);

/**
 * How long the home page's in-tolerance rates by family are reused. They are end-of-period statistics over every
 * calibration on record (a reading of the whole history, ~0.3 s at 200,000 calibrations); a calibration recorded
 * now moves them by one observation, so figures up to a minute old serve the home page as well as fresh ones. The
 * interval analysis page reads them fresh.
 */
export const FAMILY_RATES_REUSE_MS = 60_000;

export function statsService({ db, clock, timeZone, logger }: { db: Db; clock: Clock; timeZone: string; logger?: Pick<Logger, "warn"> }) {
  let rates: { at: number; value: ReturnType<typeof intervalsRepository.familyRates> } | null = null;
  /** The family rates, read at most once a minute (by elapsed time, not the shop's clock); a failed read is not kept. */
  function familyRates() {
    const now = performance.now();
    if (!rates || now - rates.at > FAMILY_RATES_REUSE_MS) {
      const value = intervalsRepository.familyRates(db);
      rates = { at: now, value };
      value.catch(() => {
        if (rates?.value === value) rates = null;
      });
    }
    return rates.value;
  }

  let folding: Promise<void> | null = null;
  /**
   * Folds the kept counts' pieces after this answer, once at a time per process (the database allows one at a time
   * anyway). A failed fold loses nothing: the pieces stay and the next count asks again.
   */
  function foldCounts() {
    if (folding) return;
    folding = foldToolStateCounts(db)
      .catch((err: unknown) => logger?.warn({ err }, "the status counts were not folded; they will be at the next count"))
      .finally(() => {
        folding = null;
      });
  }

  /** Every tool's status at `at` from the records as they stood then, in chunks (a clock set back; see summary). */
  async function allStatuses(at: Date, ctx: StatusContext) {
    const ids = await statsRepository.allToolIds(db);
    const views: ToolStatusView[] = [];
    for (let i = 0; i < ids.length; i += CHUNK) {
      const m = await gatherStatusesAt(db, ids.slice(i, i + CHUNK), at, ctx);
      views.push(...m.values());
    }
    return views;
  }

  /**
   * Counts by status now, tools still in calibration due within 7 and 30 days and in each of the next
   * twelve weeks: from the kept counts (docs/decisions/027), the same work at any register size. When some record is dated after now
   * (a clock set back), every status is derived in full instead.
   */
  async function summary(at: Date) {
    const ctx = await statusContext(db, timeZone);
    const today = calendarDate(at, ctx.timeZone);
    if (await eventsAfter(db, at)) {
      const views = await allStatuses(at, ctx);
      const dueByWeek = Array.from({ length: 12 }, () => 0);
      for (const v of views) {
        if (!IN_CALIBRATION.has(v.status) || v.daysToDue == null || v.daysToDue < 0) continue;
        const w = Math.floor(v.daysToDue / 7);
        if (w < 12) dueByWeek[w]++;
      }
      return { ...counts(views), totalTools: views.length, dueByWeek, today };
    }
    const c = await countByStatus(db, statusNow(at, ctx), [7, 30], 12);
    if (foldWanted(c)) foldCounts();
    return { byStatus: c.byStatus, dueWithin7Days: c.dueWithin[0], dueWithin30Days: c.dueWithin[1], overdue: c.byStatus.overdue, totalTools: c.total, dueByWeek: c.dueByWeek, today };
  }

  function counts(views: ToolStatusView[]) {
    const byStatus = Object.fromEntries(TOOL_STATUSES.map((s) => [s, 0])) as Record<ToolStatus, number>;
    let dueWithin30Days = 0;
    let dueWithin7Days = 0;
    for (const v of views) {
      byStatus[v.status]++;
      if (IN_CALIBRATION.has(v.status) && v.daysToDue != null && v.daysToDue >= 0) {
        if (v.daysToDue <= 30) dueWithin30Days++;
        if (v.daysToDue <= 7) dueWithin7Days++;
      }
    }
    return { byStatus, dueWithin30Days, dueWithin7Days, overdue: byStatus.overdue };
  }

  return {
    async overview(): Promise<StatsOverview> {
      const now = clock.now();
      const [c, openInvestigations] = await Promise.all([summary(now), statsRepository.openInvestigations(db)]);
      return { byStatus: c.byStatus, dueWithin30Days: c.dueWithin30Days, overdue: c.overdue, openInvestigations };
    },

    async dashboard(): Promise<StatsDashboard> {
      const now = clock.now();
      const [c, openInvestigations, notReturned, sheets, needing, rates] = await Promise.all([
        summary(now),
        statsRepository.openInvestigations(db),
        statsRepository.notReturned(db, now),
        statsRepository.sheetsAwaitingSignature(db, 1),
        statsRepository.investigationsNeedingDisposition(db, 1),
        familyRates(),
      ]);
      const today = c.today;
      // Twelve weeks counted from today (a shop's week start varies; "the next seven days" does not).
      const dueByWeek = c.dueByWeek.map((count, w) => ({ weekStart: addDays(today, 7 * w), weekEnd: addDays(today, 7 * w + 6), count }));
      return {
        byStatus: c.byStatus,
        dueWithin30Days: c.dueWithin30Days,
        dueWithin7Days: c.dueWithin7Days,
        overdue: c.overdue,
        openInvestigations,
        today,
        totalTools: c.totalTools,
        notReturned,
        sheetsAwaitingSignature: sheets.total,
        investigationsNeedingDisposition: needing.total,
        dueByWeek,
        inToleranceRateByFamily: rates
          .filter((r) => r.tools > 0)
          .map((r) => ({ familyId: r.familyId, name: r.name, recalibrations: r.recalibrations, inTolerance: r.inTolerance, rate: r.recalibrations ? r.inTolerance / r.recalibrations : null })),
      };
    },

    async mine(userId: string): Promise<StatsMine> {
      const now = clock.now();
      const ctx = await statusContext(db, timeZone);
      // The person's tools with what their status is derived from, beside their open sheets: one round.
      const [rows, openJobs] = await Promise.all([statsRepository.myTools(db, userId), statsRepository.myOpenJobs(db, userId)]);
      const statuses = await statusesOfRows(db, rows, now, ctx);
      const tools = rows
        .map((r) => {
          const s = statuses.get(r.id)!;
          return {
            assetTag: s.assetTag,
            description: r.description,
            status: s.status,
            usable: s.usable,
            dueAt: s.dueAt,
            daysToDue: s.daysToDue,
            reasons: s.reasons,
            relation: r.relation,
            dueBackAt: r.relation === "issued" && s.custodian ? s.custodian.dueBackAt : null,
          };
        })
        .sort((a, b) => (a.dueAt ?? "0000").localeCompare(b.dueAt ?? "0000") || a.assetTag.localeCompare(b.assetTag));
      return { tools, openJobs };
    },

    async inspection(): Promise<StatsInspection> {
      const [sheets, needing] = await Promise.all([statsRepository.sheetsAwaitingSignature(db), statsRepository.investigationsNeedingDisposition(db)]);
      return { sheetsAwaitingSignature: sheets.items, sheetsTotal: sheets.total, investigationsNeedingDisposition: needing.items, investigationsTotal: needing.total };
    },
  };
}
