import type { LengthUnit } from "../../../../shared/common/units";
import { cx } from "../../../components/ui/cx";
import { len, signedLen } from "../lib/format";
import type { LiveCalibration, LivePoint } from "../lib/live-calibration";
import { AsFoundBadge, ResultBadge, TurWarning } from "./result-badge";
import { AS_FOUND_STATEMENT_LABELS } from "../../../../shared/calibrations/decision-rules";

/** Error, TUR, as-found statement and release verdict of one point as the person types (the shared computation, live). */
export function LivePointCells({ point, unit, index }: { point: LivePoint | undefined; unit: LengthUnit; index: number }) {
  const j = point?.computed;
  if (!point || !j) {
    return (
      <td colSpan={3} className="py-1 pr-2 align-top text-xs text-ink-faint" aria-live="polite">
        {point?.problem ?? ""}
      </td>
    );
  }
  const label = `Point ${index + 1}`;
  return (
    <>
      <td className={cx("py-2 pr-2 align-top font-mono", !j.asFoundInTolerance && "font-semibold text-stop")} aria-label={`${label} error`}>
        {signedLen(j.errorAsFound, unit)}
        {j.errorAsLeft != null && <span className="block text-xs text-ink-soft">left {signedLen(j.errorAsLeft, unit)}</span>}
        {j.referenceSource !== "given" && j.referenceParts.length > 0 && (
          <span className="block font-sans text-xs text-ink-faint">
            vs {j.referenceParts.map((r) => (r.element ? `${r.standard} ${r.element}` : r.standard)).join(" + ")}
            {j.referenceSource !== "nominal" ? ` = ${len(j.reference, unit, unit === "in" ? 6 : 5)}` : ""}
          </span>
        )}
      </td>
      <td className={cx("py-2 pr-2 align-top", j.turAdequate === false && "font-bold text-caution")} aria-label={`${label} TUR`}>
        {j.tur == null ? "—" : `${j.tur.toFixed(1)}:1`}
        {j.turAdequate === false && <span className="block text-xs">under 4:1</span>}
      </td>
      <td className="py-2 pr-2 align-top" aria-label={`${label} verdict`}>
        <span className={cx("block text-xs", j.asFoundStatement === "pass" ? "text-go" : j.asFoundStatement === "fail" ? "font-semibold text-stop" : "font-semibold text-caution")}>
          Found: {AS_FOUND_STATEMENT_LABELS[j.asFoundStatement].toLowerCase()}
        </span>
        <span className={cx("block font-semibold", j.verdict === "pass" ? "text-go" : "text-stop")}>{j.verdict === "pass" ? "✓ Pass" : "✕ Fail"}</span>
        <span className="block text-xs font-normal text-ink-faint">
          release on {j.releasedOn === "as_left" ? "as left" : "as found"}
          {j.guardBand > 0 ? `, within ± ${len(j.acceptanceLimit, unit)}` : ""}
        </span>
      </td>
    </>
  );
}

/** The overall answer the record will carry: as-found condition and statement, release decision, next due date, TUR warning. */
export function LiveSummary({ live, unit }: { live: LiveCalibration; unit: LengthUnit }) {
  const pending = live.points.filter((p) => !p.computed).length;
  const conditional = live.points.filter((p) => p.computed && (p.computed.asFoundStatement === "conditional_pass" || p.computed.asFoundStatement === "conditional_fail")).length;
  const out = live.points.filter((p) => p.computed && !p.computed.asFoundInTolerance).length;
  return (
    <section aria-label="Result so far" aria-live="polite" className="rounded-card border-2 border-ink/20 bg-paper-raised p-4 shadow-card">
      <h2 className="mb-2 text-lg font-semibold">Result so far</h2>
      {live.overall ? (
        <div className="flex flex-col gap-1">
          <p className="flex flex-wrap items-center gap-2 text-lg font-semibold">
            As found: <AsFoundBadge inTolerance={live.overall.asFoundInTolerance} statement={live.overall.asFoundStatement} />
          </p>
          <p>
            {live.overall.asFoundInTolerance ? (
              "Every point's error is within ± MPE."
            ) : (
              <strong className="text-stop">Out of tolerance at {out} point(s): an investigation of the readings taken with this tool will be opened.</strong>
            )}
            {conditional > 0 && ` ${conditional} point(s) lie within U of a limit: they will be listed for the quality manager's review.`}
          </p>
          <p className="flex flex-wrap items-center gap-2 text-xl font-bold">
            Release: <ResultBadge result={live.overall.result} className="text-base" />
          </p>
        </div>
      ) : (
        <p className="text-ink-soft">
          {pending} point{pending === 1 ? "" : "s"} still to fill in before the overall result can be judged.
        </p>
      )}
      <p className="mt-1">
        Next due: <strong>{live.nextDueAt ?? "—"}</strong>
        <span className="text-sm text-ink-faint"> (calendar date of the calibration + the tool's interval; no grace period)</span>
      </p>
      {live.lowTurPoints > 0 && <TurWarning className="mt-2" points={live.lowTurPoints} />}
      <p className="mt-2 text-xs text-ink-faint">Computed in the browser with the same code the server signs with; lengths in {unit}.</p>
    </section>
  );
}
