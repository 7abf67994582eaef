import type { Db, DbOrTx } from "../../db/client";
import type { Clock } from "../../platform/clock";
import { intervalsRepository } from "./intervals.repository";
import { getSettings } from "../settings/settings.service";
import { statusContext, statusOf } from "../tools/tool-status.service";
import { recordAudit } from "../audit/audit.repository";
import { notFound, refused } from "../../http/errors";
import { driftTrend, endOfPeriodReliability, recommendInterval, staircaseSuggestion } from "../../../shared/intervals/interval-analysis";
import type { ApplyIntervalInput, Drift, DriftSeries, IntervalAnalysis, IntervalFamily } from "../../../shared/intervals/intervals.schemas";

/** Fewer end-of-period calibrations than this and no interval is recommended (common practice, no source). */
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
      currentIntervalDays: observedIntervalDays,
      observed: eopr.reliability ?? 0,
      target: settings.reliabilityTarget,
      observations: eopr.observations,
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
      return rows.map((r) => ({
        familyId: r.familyId,
        name: r.name,
        kind: r.kind,
        currentIntervalDays: r.defaultIntervalDays,
        tools: r.tools,
        recalibrations: r.recalibrations,
        inTolerance: r.inTolerance,
        rate: r.recalibrations ? r.inTolerance / r.recalibrations : null,
        lastDecisionAt: r.lastDecisionAt?.toISOString() ?? null,
      }));
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

    /** As-found error per check point over time, with a straight-line trend where there are three points or more. */
    async drift(assetTag: string): Promise<Drift> {
      const tool = await intervalsRepository.findTool(db, assetTag);
      if (!tool) throw notFound("tool", assetTag);
      const ctx = await statusContext(db, timeZone);
      const status = await statusOf(db, tool.id, clock.now(), ctx);
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
            errorAsLeft: p.error_as_left == null ? null : Number(p.error_as_left),
            mpe: Number(p.mpe),
            asFoundInTolerance: Boolean(p.as_found_in_tolerance),
          }));
          const trend = driftTrend(points.map((p) => ({ at: p.performedAt, error: p.errorAsFound })), mpe);
          const exceed = trend?.predictedExceedAt ?? null;
          const flagged = !!exceed && !!status.dueAt && exceed <= status.dueAt;
          const message = !trend
            ? `${points.length} calibration${points.length === 1 ? "" : "s"} at this point; a trend needs at least three.`
            : !exceed
              ? "The as-found error shows no trend toward the permissible error."
              : flagged
                ? `Predicted to leave tolerance around ${exceed}, before the next due date (${status.dueAt}): consider recalibrating sooner.`
                : `Predicted to leave tolerance around ${exceed}.`;
          return { key, nominal: Number(pts[0].nominal), element: pts[0].element, mpe, points, trend, flagged, message };
        })
        .sort((a, b) => (a.element ?? "").localeCompare(b.element ?? "") || a.nominal - b.nominal);
      return { assetTag: tool.assetTag, description: tool.description, unit: tool.unit, dueAt: status.dueAt, series, flagged: series.some((s) => s.flagged) };
    },
  };
}
