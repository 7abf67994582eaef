import { Link, useParams } from "react-router-dom";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { useApplyInterval, useIntervalAnalysis } from "../api/intervals";
import { useCan } from "../../auth/api/auth";
import { Button, ButtonLink } from "../../../components/ui/button";
import { Card, ErrorNote, Facts, Loading, PageHeader } from "../../../components/ui/layout";
import { TextAreaField, TextField } from "../../../components/ui/field";
import { Cautions } from "../../../components/ui/cautions";
import { errorMessage } from "../../../lib/api-client";
import { ApplyIntervalSchema, type ApplyIntervalInput, type IntervalAnalysis } from "../../../../shared/intervals/intervals.schemas";
import { downloadCsv } from "../lib/export-csv";
import { day, pct, when } from "./format";

export function FamilyIntervalPage() {
  const { familyId = "" } = useParams();
  const q = useIntervalAnalysis(familyId);
  const canApply = useCan("intervals.apply");
  if (q.isPending) return <Loading what="Reading the family's calibration history" />;
  if (q.isError) return <ErrorNote>{errorMessage(q.error)}</ErrorNote>;
  const a = q.data;
  const tags = [...new Set(a.observations.map((o) => o.assetTag))].sort();
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title={`Interval review: ${a.familyName}`}
        subtitle="End-of-period reliability: the share of recalibrations found in tolerance as found. A tool's first calibration, and history imported from a previous register, are not end-of-period observations."
        actions={<ButtonLink to="/analysis/intervals">All families</ButtonLink>}
      />
      <div className="grid gap-4 lg:grid-cols-2">
        <Card title="Interval test (NCSL RP-1 method A3) and reliability model">
          <p className={`mb-3 text-xl font-bold ${a.decision === "keep" ? "text-go" : a.decision === "none" ? "text-ink-soft" : "text-stop"}`}>
            {a.decision === "keep"
              ? `Keep ${a.currentIntervalDays} days`
              : a.decision === "none"
                ? "No basis for a decision yet"
                : `${a.decision === "shorten" ? "Shorten" : "Lengthen"} to ${a.recommendedIntervalDays ?? "—"} days`}
          </p>
          <RateBar analysis={a} />
          <Facts
            items={[
              ["End-of-period calibrations", `${a.calibrations} (${a.inTolerance} in tolerance; ${a.totalCalibrations} record${a.totalCalibrations === 1 ? "" : "s"} in all)`],
              ["Observed rate (in tolerance as found)", pct(a.asFoundInToleranceRate)],
              [`Its ${(a.confidence * 100).toFixed(0)} % Clopper-Pearson interval`, a.confidenceInterval ? `${pct(a.confidenceInterval.lower)} – ${pct(a.confidenceInterval.upper)}` : "—"],
              ["Reliability target R*", pct(a.reliabilityTarget)],
              ["Current interval", `${a.currentIntervalDays} days`],
              ["Interval observed under (I_old)", `${a.observedIntervalDays} days`],
              ["Recommended interval", a.recommendedIntervalDays == null ? "None yet" : `${a.recommendedIntervalDays} days (set as ${a.recommendedWholeDays} days)`],
              ["Sizing a change", "I_new = I_old · ln(R*) / ln(R observed) (exponential model)"],
              ["Step limit", `lengthen at most ×${a.maxStepFactor} per review, after at least ${a.minObservations} recalibrations`],
            ]}
          />
          <p className="mt-3 text-sm" role="status">
            {a.reason}
          </p>
        </Card>
        <Card title="Staircase suggestion (ILAC-G24 method 1)">
          {a.staircase ? (
            <>
              <p className="text-2xl font-bold">{a.staircase.suggestedIntervalDays} days</p>
              <p className="text-sm text-ink-soft">{a.staircase.reason}</p>
              <p className="mt-2 text-xs text-ink-faint">The staircase looks only at the latest recalibration; the reliability model uses the whole history.</p>
            </>
          ) : (
            <p className="text-sm text-ink-faint">No recalibration on record yet.</p>
          )}
        </Card>
      </div>
      {canApply && <ApplyCard analysis={a} />}
      <Card title="Decisions on this family's interval">
        {a.decisions.length === 0 ? (
          <p className="text-sm text-ink-faint">No interval decision recorded yet.</p>
        ) : (
          <ul className="divide-y divide-paper-line text-sm">
            {a.decisions.map((d) => (
              <li key={d.id} className="py-2">
                <strong>
                  {d.previousIntervalDays} → {d.newIntervalDays} days
                </strong>{" "}
                by {d.decidedByName}, {when(d.decidedAt)} ({d.method.replace(/_/g, " ")})
                <p className="text-ink-soft">{d.rationale}</p>
              </li>
            ))}
          </ul>
        )}
      </Card>
      <Card
        title="Calibrations the review rests on"
        actions={
          <Button
            variant="secondary"
            disabled={!a.observations.length}
            onClick={() =>
              downloadCsv(`tenthwise-interval-${a.familyName}`, [
                { header: "assetTag", value: (o) => o.assetTag },
                { header: "performedAt", value: (o) => o.performedAt },
                { header: "asFoundInTolerance", value: (o) => (o.asFoundInTolerance ? "yes" : "no") },
                { header: "endOfPeriod", value: (o) => (o.endOfPeriod ? "yes" : "no") },
                { header: "imported", value: (o) => (o.imported ? "yes" : "no") },
                { header: "intervalDays", value: (o) => o.intervalDays },
              ], a.observations)
            }
          >
            Export this list
          </Button>
        }
      >
        <p className="mb-2 text-sm">
          Drift of each tool's errors:{" "}
          {tags.length === 0
            ? "no tools calibrated yet."
            : tags.map((t, i) => (
                <span key={t}>
                  {i > 0 && ", "}
                  <Link className="underline" to={`/analysis/drift/${encodeURIComponent(t)}`}>
                    {t}
                  </Link>
                </span>
              ))}
        </p>
        <div className="max-h-96 overflow-auto">
          <table className="w-full text-left text-sm" aria-label="Calibrations of the family">
            <thead className="sticky top-0 bg-paper-sunk text-xs uppercase text-ink-soft">
              <tr>
                <th className="px-2 py-1">Tool</th>
                <th className="px-2 py-1">Calibrated</th>
                <th className="px-2 py-1">As found</th>
                <th className="px-2 py-1">Counted</th>
              </tr>
            </thead>
            <tbody>
              {[...a.observations].reverse().map((o) => (
                <tr key={o.calibrationId} className="border-t border-paper-line">
                  <td className="px-2 py-1">{o.assetTag}</td>
                  <td className="px-2 py-1">{day(o.performedAt)}</td>
                  <td className="px-2 py-1">{o.imported ? "unknown (imported)" : o.asFoundInTolerance ? "✓ in tolerance" : "✕ out of tolerance"}</td>
                  <td className="px-2 py-1">{o.endOfPeriod ? "yes" : o.imported ? "no: imported" : "no: first calibration"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Card>
      <Cautions compact />
    </div>
  );
}

/** The observed rate, its confidence interval and the target on one 0–100 % scale: the target outside the bar means a significant difference. */
function RateBar({ analysis: a }: { analysis: IntervalAnalysis }) {
  if (!a.confidenceInterval || a.asFoundInToleranceRate == null) return null;
  const { lower, upper } = a.confidenceInterval;
  const x = (r: number) => `${(r * 100).toFixed(2)}%`;
  const outside = a.reliabilityTarget < lower || a.reliabilityTarget > upper;
  return (
    <figure className="mb-3" aria-label={`Observed rate ${pct(a.asFoundInToleranceRate)}, interval ${pct(lower)} to ${pct(upper)}, target ${pct(a.reliabilityTarget)}${outside ? " outside" : " inside"} the interval`}>
      <div className="relative h-6 rounded bg-paper-sunk">
        <div className={`absolute top-1 h-4 rounded ${outside ? "bg-stop/40" : "bg-go/40"}`} style={{ left: x(lower), width: `${((upper - lower) * 100).toFixed(2)}%` }} />
        <div className="absolute top-0 h-6 w-0.5 bg-ink" style={{ left: x(a.asFoundInToleranceRate) }} title="observed rate" />
        <div className="absolute -top-1 h-8 w-0.5 bg-caution" style={{ left: x(a.reliabilityTarget) }} title="target" />
      </div>
      <figcaption className="mt-1 flex justify-between text-xs text-ink-faint">
        <span>0 %</span>
        <span>
          bar: the rate's interval · black: observed · amber: target R* {outside ? "(outside: significant)" : "(inside: not significant)"}
        </span>
        <span>100 %</span>
      </figcaption>
    </figure>
  );
}

function ApplyCard({ analysis: a }: { analysis: IntervalAnalysis }) {
  const apply = useApplyInterval(a.familyId);
  const form = useForm<ApplyIntervalInput>({
    resolver: zodResolver(ApplyIntervalSchema),
    defaultValues: { newIntervalDays: a.recommendedWholeDays ?? a.staircase?.suggestedIntervalDays ?? a.currentIntervalDays, rationale: "" },
  });
  const e = form.formState.errors;
  return (
    <Card title="Record an interval decision">
      <p className="mb-3 text-sm text-ink-soft">
        The family and every tool in it get the new interval for calibrations from now on; due dates already recorded stay as they are. The decision keeps the figures
        above as the data it rested on.
      </p>
      <form noValidate className="grid gap-3 md:grid-cols-[12rem_1fr_auto] md:items-end" onSubmit={form.handleSubmit((v) => apply.mutate(v, { onSuccess: () => form.reset({ ...v, rationale: "" }) }))}>
        <TextField label="New interval (days)" type="number" inputMode="numeric" error={e.newIntervalDays?.message} {...form.register("newIntervalDays", { valueAsNumber: true })} />
        <TextAreaField label="Rationale" error={e.rationale?.message} {...form.register("rationale")} />
        <Button type="submit" disabled={apply.isPending}>
          Record decision
        </Button>
      </form>
      {apply.isError && <div className="mt-2"><ErrorNote>{errorMessage(apply.error)}</ErrorNote></div>}
      {apply.isSuccess && (
        <p role="status" className="mt-2 text-sm text-go">
          Recorded; {apply.data.toolsChanged} tool{apply.data.toolsChanged === 1 ? "" : "s"} now on the new interval.
        </p>
      )}
    </Card>
  );
}
