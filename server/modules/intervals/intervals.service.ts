import type { Db, DbOrTx } from "../../db/client";
import type { Clock } from "../../platform/clock";
import { intervalsRepository } from "./intervals.repository";
import { getSettings } from "../settings/settings.service";
import { statusContext, statusOf } from "../tools/tool-status.service";
import { recordAudit } from "../audit/audit.repository";
import { notFound, refused } from "../../http/errors";
import { driftTrend, endOfPeriodReliability, recommendInterval, staircaseSuggestion } from "../../../shared/intervals/interval-analysis";
import type { ApplyIntervalInput, Drift, DriftSeries, IntervalAnalysis, IntervalFamily } from "../../../shared/intervals/intervals.schemas";

/** Fewer end-of-period calibrations than this and no interval is lengthened (common practice, no source); shortening is never held back. */
export const MIN_OBSERVATIONS = 10;

export function intervalsService({ db, clock, timeZone }: { db: Db; clock: Clock; timeZone: string }) {
  async function analyse(dbx: DbOrTx, familyId: string): Promise<IntervalAnalysis> {
    const family = await intervalsRepository.findFamily(dbx, familyId);
    if (!family) throw notFound("family", familyId);
    const settings = await getSettings(dbx, timeZone);
    const observations = await intervalsRepository.observations(dbx, familyId);
    const eopr = endOfPeriodReliability(observations.map((o) => ({ asFoundInTolerance: o.asFoundInTolerance, isFirst: !o.endOfPeriod })));
    // NCSL RP-1 scales the interval the observations were made under (I_old), not whatever the family is set to now:
    // after a decision, the same history must still recommend the same interval.
    const periods = observations.filter((o) => o.endOfPeriod && o.periodDays).map((o) => o.periodDays!);
    const observedIntervalDays = periods.length ? Math.round((periods.reduce((a, b) => a + b, 0) / periods.length) * 10) / 10 : family.defaultIntervalDays;
    const rec = recommendInterval({
      observedIntervalDays,
      currentIntervalDays: family.defaultIntervalDays,
      inTolerance: eopr.inTolerance,
      observations: eopr.observations,
      target: settings.reliabilityTarget,
      confidence: settings.intervalConfidence,
      minObservations: MIN_OBSERVATIONS,
      maxStepFactor: settings.maxIntervalStepFactor,
    });
    const lastEop = [...observations].reverse().find((o) => o.endOfPeriod);
    const decisions = await intervalsRepository.decisions(dbx, familyId);
    return {
      calibrations: eopr.observations,
      asFoundInToleranceRate: eopr.reliability,
      currentIntervalDays: family.defaultIntervalDays,
      observedIntervalDays,
      recommendedIntervalDays: rec.recommendedIntervalDays,
      method: rec.method,
      reliabilityTarget: settings.reliabilityTarget,
      decision: rec.decision,
      confidenceInterval: rec.confidenceInterval,
      confidence: rec.confidence,
      familyId: family.id,
      familyName: family.name,
      inTolerance: eopr.inTolerance,
      totalCalibrations: observations.length,
      recommendedWholeDays: rec.recommendedWholeDays,
      reason: rec.reason,
      minObservations: MIN_OBSERVATIONS,
      maxStepFactor: settings.maxIntervalStepFactor,
      staircase: lastEop ? staircaseSuggestion({ currentIntervalDays: family.defaultIntervalDays, lastAsFoundInTolerance: lastEop.asFoundInTolerance }) : null,
      observations: observations.map(({ periodDays: _p, ...o }) => ({ ...o, performedAt: o.performedAt.toISOString() })),
      decisions: decisions.map((d) => ({ ...d, decidedAt: d.decidedAt.toISOString() })),
    };
  }

  return {
    analyse: (familyId: string) => analyse(db, familyId),

    async families(): Promise<IntervalFamily[]> {
      const rows = await intervalsRepository.familyRates(db);
      const settings = await getSettings(db, timeZone);
      return rows.map((r) => {
        const rec = recommendInterval({
          observedIntervalDays: r.observedIntervalDays ?? r.defaultIntervalDays,
          currentIntervalDays: r.defaultIntervalDays,
          inTolerance: r.inTolerance,
          observations: r.recalibrations,
          target: settings.reliabilityTarget,
          confidence: settings.intervalConfidence,
          minObservations: MIN_OBSERVATIONS,
          maxStepFactor: settings.maxIntervalStepFactor,
        });
        return {
          familyId: r.familyId,
          name: r.name,
          kind: r.kind,
          currentIntervalDays: r.defaultIntervalDays,
          tools: r.tools,
          recalibrations: r.recalibrations,
          inTolerance: r.inTolerance,
          rate: r.recalibrations ? r.inTolerance / r.recalibrations : null,
          confidenceInterval: rec.confidenceInterval,
          reliabilityTarget: settings.reliabilityTarget,
          decision: rec.decision,
          recommendedIntervalDays: rec.recommendedIntervalDays,
          reason: rec.reason,
          lastDecisionAt: r.lastDecisionAt?.toISOString() ?? null,
        };
      });
    },

    /**
     * Records an interval decision with the analysis it rested on, and sets the
     * family's interval and its tools' intervals for calibrations from now on.
     */
    async apply(familyId: string, input: ApplyIntervalInput, actor: { id: string; name: string }) {
      return db.transaction(async (tx) => {
        const family = await intervalsRepository.lockFamily(tx, familyId);
        if (!family) throw notFound("family", familyId);
        const analysis = await analyse(tx, familyId);
        const current = family.defaultIntervalDays;
        if (input.newIntervalDays === current) throw refused("interval_unchanged", `The family's interval is already ${current} days.`);
        // One review may lengthen by at most the admin's step factor; shortening is never limited (the safe side).
        if (input.newIntervalDays > current * analysis.maxStepFactor) {
          throw refused(
            "interval_step_too_large",
            `One review may lengthen the interval to at most ×${analysis.maxStepFactor} (${Math.floor(current * analysis.maxStepFactor)} days); the administrator sets this limit.`,
          );
        }
        const method =
          input.method ??
          (input.newIntervalDays === analysis.recommendedWholeDays
            ? "exponential_reliability"
            : input.newIntervalDays === analysis.staircase?.suggestedIntervalDays
              ? "staircase"
              : "engineering_judgement");
        const now = clock.now();
        const { observations, decisions, ...summary } = analysis;
        const data = { ...summary, observationIds: observations.filter((o) => o.endOfPeriod).map((o) => o.calibrationId), previousDecisions: decisions.length };
        const decision = await intervalsRepository.insertDecision(tx, {
          familyId,
          decidedBy: actor.id,
          decidedAt: now,
          previousIntervalDays: current,
          newIntervalDays: input.newIntervalDays,
          method,
          rationale: input.rationale,
          data,
        });
        await intervalsRepository.setFamilyInterval(tx, familyId, input.newIntervalDays);
        const changed = await intervalsRepository.setToolsInterval(tx, familyId, input.newIntervalDays);
        await recordAudit(tx, {
          actorId: actor.id,
          action: "family.interval_change",
          entityType: "family",
          entityId: familyId,
          before: { defaultIntervalDays: current },
          after: { defaultIntervalDays: input.newIntervalDays, decisionId: decision.id, method, rationale: input.rationale, toolsChanged: changed },
          at: now,
        });
        return {
          decision: { ...decision, decidedAt: decision.decidedAt.toISOString(), decidedByName: actor.name },
          familyId,
          toolsChanged: changed.length,
        };
      });
    },

    /**
     * Drift per check point: over each interval, from the as-left error to the next as-found error (never across an
     * adjustment), with the fitted rate, its uncertainty, and when the point would reach its permissible error.
     */
    async drift(assetTag: string): Promise<Drift> {
      const tool = await intervalsRepository.findTool(db, assetTag);
      if (!tool) throw notFound("tool", assetTag);
      const ctx = await statusContext(db, timeZone);
      const now = clock.now();
      const status = await statusOf(db, tool.id, now, ctx);
      const rows = await intervalsRepository.driftPoints(db, tool.id);
      const groups = new Map<string, typeof rows>();
      for (const r of rows) {
        // One series per check point: the nominal, and for a set the element it belongs to.
        const key = `${r.element ?? ""}|${Number(r.nominal)}`;
        groups.set(key, [...(groups.get(key) ?? []), r]);
      }
      const series: DriftSeries[] = [...groups.entries()]
        .map(([key, pts]) => {
          const mpe = Number(pts[pts.length - 1].mpe);
          const points = pts.map((p) => ({
            calibrationId: p.calibration_id,
            performedAt: new Date(p.performed_at).toISOString(),
            errorAsFound: Number(p.error_as_found),
            errorAsLeft: p.adjusted && p.error_as_left != null ? Number(p.error_as_left) : null,
            adjusted: Boolean(p.adjusted),
            mpe: Number(p.mpe),
            asFoundInTolerance: Boolean(p.as_found_in_tolerance),
          }));
          const t = driftTrend(points.map((p) => ({ at: p.performedAt, errorAsFound: p.errorAsFound, errorAsLeft: p.errorAsLeft })), mpe, tool.intervalDays, now);
          const today = now.toISOString().slice(0, 10);
          const flagged = t.outlook === "already_out" || t.outlook === "may_have_left" || (t.outlook === "predicted" && !!status.dueAt && t.predictedExceedAt! <= status.dueAt);
          return {
            key,
            nominal: Number(pts[0].nominal),
            element: pts[0].element,
            mpe,
            points,
            intervals: t.intervals,
            trend:
              t.ratePerDay == null
                ? null
                : { ratePerDay: t.ratePerDay, rateUncertaintyPerDay: t.rateUncertaintyPerDay!, k: t.k!, startAt: t.startAt!, startError: t.startError!, horizonAt: t.horizonAt!, predictedExceedAt: t.predictedExceedAt, earliestExceedAt: t.earliestExceedAt },
            outlook: t.outlook,
            flagged,
            message: driftMessage(t, points.length, status.dueAt, today),
          };
        })
        .sort((a, b) => (a.element ?? "").localeCompare(b.element ?? "") || a.nominal - b.nominal);
      return { assetTag: tool.assetTag, description: tool.description, unit: tool.unit, dueAt: status.dueAt, series, flagged: series.some((s) => s.flagged) };
    },
  };
}

/** What a drift series says, in words a quality manager acts on. */
function driftMessage(t: ReturnType<typeof driftTrend>, calibrations: number, dueAt: string | null, today: string): string {
  const soon = (d: string) => (dueAt && d <= dueAt ? `, before the next due date (${dueAt}): consider recalibrating sooner` : "");
  // The earliest date allowing for the fit's uncertainty, when it is still ahead and earlier than the fitted one.
  const early = t.earliestExceedAt && t.earliestExceedAt > today && (!t.predictedExceedAt || t.earliestExceedAt < t.predictedExceedAt) ? t.earliestExceedAt : null;
  const uncertain = `; allowing for the fit's uncertainty (k = ${t.k?.toFixed(2)}) it could be as early as ${early}`;
  switch (t.outlook) {
    case "insufficient":
      return `${calibrations} calibration${calibrations === 1 ? "" : "s"} at this point: a drift rate needs at least two intervals (three calibrations).`;
    case "already_out":
      return "Left outside its permissible error at the last calibration: no prediction; it must not be used until repaired and recalibrated.";
    case "no_trend":
      return "No drift between calibrations: not expected to leave tolerance within two intervals.";
    case "beyond_two_intervals":
      return `Not expected to leave tolerance within two intervals (by ${t.horizonAt})${early ? uncertain : ""}.`;
    case "may_have_left":
      return `May already have left tolerance: the drift since the last calibration reaches the permissible error around ${t.predictedExceedAt}. Check it before use.`;
    case "predicted":
      return `Expected to reach the permissible error around ${t.predictedExceedAt}${early ? uncertain : ""}${soon(t.predictedExceedAt!)}.`;
  }
}
