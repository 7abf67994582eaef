import type { ReactNode } from "react";
import { Link } from "react-router-dom";
import type { Calibration, CalibrationPoint } from "../../../../shared/calibrations/calibrations.schemas";
import type { ToolDetail } from "../../../../shared/tools/tools.schemas";
import { useCan } from "../../auth/api/auth";
import { useCalibrations } from "../api/calibrations";
import { Card, EmptyState, ErrorNote, Facts, Loading } from "../../../components/ui/layout";
import { cx } from "../../../components/ui/cx";
import { errorMessage } from "../../../lib/api-client";
import { day, len, signedLen, when } from "../lib/format";
import { RecordTable } from "../components/record-table";
import { AS_FOUND_STATEMENT_LABELS, AS_FOUND_STATEMENT_MEANINGS, DECISION_RULE_LABELS } from "../../../../shared/calibrations/decision-rules";
import { budgetLength, budgetQuantity, budgetSensitivity, budgetSummary, DISTRIBUTION_LABELS, dofText } from "../../../../shared/calibrations/budget-format";
import { ReviewForm } from "./review-form";
import { AsFoundBadge, ResultBadge, TurWarning } from "./result-badge";

/** Every calibration record of the tool, newest first as the server orders them (a correction leads the record it corrects); superseded records stay, marked. */
export function CalibrationHistory({ tool }: { tool: ToolDetail }) {
  const cals = useCalibrations(tool.assetTag);
  return (
    <Card title="Calibration history">
      {cals.isPending ? <Loading /> : cals.isError ? <ErrorNote>{errorMessage(cals.error)}</ErrorNote> : cals.data.items.length === 0 ? (
        <EmptyState>No calibration on record.</EmptyState>
      ) : (
        <ol className="flex flex-col gap-4" aria-label="Calibration records">
          {cals.data.items.map((c, i) => (
            <CalibrationRecord key={c.id} c={c} tool={tool} open={i === 0} />
          ))}
        </ol>
      )}
    </Card>
  );
}

function CalibrationRecord({ c, tool, open }: { c: Calibration; tool: ToolDetail; open: boolean }) {
  const canCorrect = useCan("calibrations.write");
  const canReview = useCan("calibrations.review");
  const superseded = !!c.supersededById;
  return (
    <li aria-label={`Calibration of ${day(c.performedAt)}`} className={cx("rounded-md border p-3", superseded ? "border-dashed border-paper-line bg-paper-sunk/60 text-ink-soft" : "border-paper-line")}>
      <div className="mb-2 flex flex-wrap items-center gap-2">
        <strong className="text-base">{when(c.performedAt)}</strong>
        <span className="text-xs text-ink-soft">As found</span>
        <AsFoundBadge inTolerance={c.asFoundInTolerance} statement={c.asFoundStatement} />
        <span className="text-xs text-ink-soft">Release</span>
        <ResultBadge result={c.result} />
        <span className="text-sm">{c.source === "in_house" ? "In-house" : `Outside lab: ${c.lab?.name ?? "—"}`}</span>
        {superseded && <span className="rounded-full border border-ink-faint px-2 py-0.5 text-xs font-semibold uppercase">Superseded — no longer counts</span>}
        {c.awaitingReview && !superseded && <span className="rounded-full border border-caution/50 bg-caution-light px-2 py-0.5 text-xs font-semibold text-caution">! Awaiting certificate review</span>}
        {canCorrect && !superseded && (
          <Link className="ml-auto text-sm underline" to={`/tools/${encodeURIComponent(tool.assetTag)}/calibrate?supersedes=${c.id}`}>
            Correct this record
          </Link>
        )}
      </div>
      <Facts
        items={[
          [
            "As found",
            <span>
              {c.asFoundInTolerance ? "In tolerance" : <span className="font-semibold text-stop">Out of tolerance</span>} (error against ± MPE) ·{" "}
              {AS_FOUND_STATEMENT_LABELS[c.asFoundStatement]}: {AS_FOUND_STATEMENT_MEANINGS[c.asFoundStatement]}
            </span>,
          ],
          ["Adjusted", c.adjusted ? "Yes: released on the as-left readings" : "No: released on the as-found readings"],
          ["Next due", c.nextDueAt],
          ["Performed by", c.performedBy?.name ?? c.performedByName],
          ["Decision rule", `${DECISION_RULE_LABELS[c.decisionRule]}${c.decisionRule === "guarded_scaled" ? `, r = ${c.guardBandMultiplier}` : ""}`],
          [
            "Environment",
            [c.temperatureC != null ? `${c.temperatureC} °C` : null, c.temperatureVariationC != null ? `± ${c.temperatureVariationC} °C variation` : null, c.humidityPct != null ? `${c.humidityPct} % RH` : null]
              .filter(Boolean)
              .join(", ") || null,
          ],
          [
            "Standards used",
            c.standards.length ? (
              <span className="flex flex-wrap gap-x-3">
                {c.standards.map((s) => (
                  <Link key={s.id} className="underline" to={`/standards/${s.id}`}>
                    {s.assetTag} {s.name}
                  </Link>
                ))}
              </span>
            ) : null,
          ],
          [
            "Certificate",
            c.certificateNumber || c.hasCertificateFile ? (
              <span>
                {c.certificateNumber ?? ""}{" "}
                {c.hasCertificateFile && c.certificateFileUrl && (
                  <a className="underline" href={c.certificateFileUrl} target="_blank" rel="noreferrer">
                    Download certificate
                  </a>
                )}
              </span>
            ) : null,
          ],
          ["Limited to", c.limitedRange ? `${len(c.limitedRange.min, c.unit)} – ${len(c.limitedRange.max, c.unit)}${c.limitedRange.note ? ` (${c.limitedRange.note})` : ""}` : null],
          ["Corrects an earlier record", c.supersedesId ? c.supersedeReason : null],
          ["Notes", c.notes],
          ["Investigation", c.investigationId ? <Link className="underline" to={`/investigations/${c.investigationId}`}>Opened by this finding</Link> : null],
          [
            "Record",
            <a className="underline" href={`/api/calibrations/${c.id}/record.pdf`} target="_blank" rel="noreferrer">
              Calibration record with uncertainty budgets (PDF)
            </a>,
          ],
        ].filter(([, v]) => v != null && v !== "") as [string, ReactNode][]}
      />
      {c.turWarning && <TurWarning className="mt-2" />}
      {c.source === "outside_lab" && (
        <div className="mt-2">
          {c.review ? (
            <p className={cx("rounded-md px-3 py-2 text-sm", c.review.accepted ? "bg-go-light" : "bg-stop-light")}>
              <strong>{c.review.accepted ? "Certificate reviewed and accepted" : "Certificate reviewed and NOT accepted"}</strong> by {c.review.reviewedBy?.name ?? "—"} on {when(c.review.reviewedAt)}: {c.review.findings}
            </p>
          ) : (
            !superseded && canReview && <ReviewForm calibration={c} />
          )}
        </div>
      )}
      <details className="mt-3" open={open && !superseded}>
        <summary className="cursor-pointer text-sm font-semibold">Check points ({c.points.length})</summary>
        <PointsTable points={c.points} unit={c.unit} />
      </details>
      <details className="mt-2">
        <summary className="cursor-pointer text-sm font-semibold">Uncertainty budget of each point</summary>
        <div className="mt-2 flex flex-col gap-3">
          {c.points.map((p) => (
            <PointBudget key={p.id} point={p} unit={c.unit} />
          ))}
        </div>
      </details>
    </li>
  );
}

/** One point's uncertainty budget as signed: every contribution, u_c, ν_eff, k and U (JCGM 100). */
export function PointBudget({ point: p, unit }: { point: CalibrationPoint; unit: "in" | "mm" }) {
  const title = `Point ${p.seq}: ${len(p.nominal, unit)}${p.elementLabel ? ` (element ${p.elementLabel})` : ""}`;
  if (!p.budget) {
    return (
      <p className="text-sm">
        <strong>{title}</strong> — {p.uncertainty == null ? "no uncertainty stated, and none could be computed." : `U = ${len(p.uncertainty, unit, 6)} as entered on the record (e.g. from the lab's certificate); no budget computed.`}
      </p>
    );
  }
  const b = p.budget;
  return (
    <div>
      <p className="text-sm font-semibold">{title}</p>
      {p.referenceParts.length > 0 && (
        <p className="text-xs text-ink-soft">
          Reference {len(p.reference, unit, unit === "in" ? 6 : 5)} from{" "}
          {p.referenceParts.map((r) => `${r.standard}${r.element ? ` block ${r.element}` : ""} ${r.certified ? `certified ${len(r.value, unit, unit === "in" ? 6 : 5)}` : "at nominal"}`).join(" + ")}
        </p>
      )}
      <RecordTable label={`Uncertainty budget, point ${p.seq}`} className="mt-1" headers={["Source", "Type", "Distribution", "Value", "Divisor", "Sensitivity c", "|c|·u", "Degrees of freedom"]}>
        {b.components.map((r, i) => (
          <tr key={i} className="border-t border-paper-line">
            <td className="py-1 pr-3">{r.source}</td>
            <td className="pr-3">{r.type}</td>
            <td className="pr-3">{DISTRIBUTION_LABELS[r.distribution]}</td>
            <td className="whitespace-nowrap pr-3">{budgetQuantity(r, unit)}</td>
            <td className="pr-3">{r.divisorLabel}</td>
            <td className="whitespace-nowrap pr-3">{budgetSensitivity(r, unit)}</td>
            <td className="whitespace-nowrap pr-3 font-mono">{budgetLength(r.contribution, unit)}</td>
            <td>{dofText(r.dof)}</td>
          </tr>
        ))}
      </RecordTable>
      <p className="mt-1 text-sm font-semibold">{budgetSummary(b, p.uncertainty)}</p>
      {b.notes.map((n) => (
        <p key={n} className="text-xs text-ink-faint">
          {n}
        </p>
      ))}
    </div>
  );
}

/** The signed points of a record: the server's own numbers, shown as recorded. */
export function PointsTable({ points, unit }: { points: CalibrationPoint[]; unit: "in" | "mm" }) {
  return (
    <RecordTable label="Check points" className="mt-2 whitespace-nowrap" headers={["Nominal", "Reference", "As found", "Error", "As-found statement", "As left", "MPE ±", "U", "TUR", "Release"]}>
      {points.map((p) => (
        <tr key={p.id} className="border-t border-paper-line">
          <td className="py-1 pr-3">
            {len(p.nominal, unit)}
            {p.elementLabel && <span className="block text-xs text-ink-faint">element {p.elementLabel}</span>}
          </td>
          <td className="pr-3">{len(p.reference, unit)}</td>
          <td className="pr-3">{len(p.asFound, unit)}</td>
          <td className={cx("pr-3", !p.asFoundInTolerance && "font-semibold text-stop")}>{signedLen(p.errorAsFound, unit)}</td>
          <td className={cx("pr-3", p.asFoundStatement === "pass" ? "text-go" : p.asFoundStatement === "fail" ? "font-semibold text-stop" : "font-semibold text-caution")}>
            {AS_FOUND_STATEMENT_LABELS[p.asFoundStatement]}
          </td>
          <td className="pr-3">{p.asLeft == null ? "—" : `${len(p.asLeft, unit)} (${signedLen(p.errorAsLeft, unit)})`}</td>
          <td className="pr-3">{len(p.mpe, unit)}</td>
          <td className="pr-3">{p.uncertainty == null ? "—" : len(p.uncertainty, unit, 6)}</td>
          <td className={cx("pr-3", p.turAdequate === false && "font-semibold text-caution")}>{p.tur == null ? "—" : `${p.tur.toFixed(1)}:1`}</td>
          <td className={cx("font-semibold", p.verdict === "pass" ? "text-go" : "text-stop")}>
            {p.verdict === "pass" ? "✓ Pass" : "✕ Fail"}
            <span className="block text-xs font-normal text-ink-faint">
              on {p.releasedOn === "as_left" ? "as left" : "as found"}
              {p.guardBand > 0 ? `, within ± ${len(p.acceptanceLimit, unit)}` : ""}
            </span>
          </td>
        </tr>
      ))}
    </RecordTable>
  );
}

