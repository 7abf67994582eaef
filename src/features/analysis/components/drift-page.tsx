import { useParams } from "react-router-dom";
import { Area, CartesianGrid, ComposedChart, Legend, Line, ReferenceArea, ReferenceLine, ResponsiveContainer, Scatter, Tooltip, XAxis, YAxis } from "recharts";
import { useDrift } from "../api/intervals";
import { useCan } from "../../auth/api/auth";
import { Button, ButtonLink } from "../../../components/ui/button";
import { Card, EmptyState, ErrorNote, Loading, PageHeader } from "../../../components/ui/layout";
import { Cautions } from "../../../components/ui/cautions";
import { cx } from "../../../components/ui/cx";
import { errorMessage } from "../../../lib/api-client";
import type { DriftSeries } from "../../../../shared/intervals/intervals.schemas";
import { downloadCsv } from "../lib/export-csv";
import { day } from "./format";

const MS_PER_DAY = 86_400_000;
const ms = (iso: string) => Date.parse(iso.length === 10 ? `${iso}T12:00:00Z` : iso);
const monthLabel = { format: (d: Date) => d.toISOString().slice(0, 7) };

/** Tick marks on the first of a month (every 1, 2, 3, 6 or 12 months so that about eight fit), labelled "Jan 2026". */
export function monthTicks(from: number, to: number): number[] {
  const start = new Date(from);
  const months = (new Date(to).getUTCFullYear() - start.getUTCFullYear()) * 12 + new Date(to).getUTCMonth() - start.getUTCMonth() + 1;
  const step = [1, 2, 3, 6, 12].find((s) => months / s <= 8) ?? 12;
  const ticks: number[] = [];
  let y = start.getUTCFullYear();
  let m = start.getUTCMonth() + 1;
  // Align to a multiple of the step, so ticks fall on quarters, half-years or Januaries.
  while ((m % step) !== 0 && step !== 1) m++;
  for (;;) {
    const t = Date.UTC(y + Math.floor(m / 12), m % 12, 1);
    if (t > to) break;
    if (t >= from) ticks.push(t);
    m += step;
  }
  return ticks;
}

export function DriftPage() {
  const { assetTag = "" } = useParams();
  const q = useDrift(assetTag);
  const canReview = useCan("intervals.read");
  if (q.isPending) return <Loading what="Reading the calibration history" />;
  if (q.isError) return <ErrorNote>{errorMessage(q.error)}</ErrorNote>;
  const d = q.data;
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title={`Drift: ${d.assetTag}`}
        subtitle={`${d.description} · error at each check point over each interval, from as left to the next as found${d.dueAt ? ` · next due ${day(d.dueAt)}` : ""}`}
        actions={
          <>
            <ButtonLink to={`/tools/${encodeURIComponent(d.assetTag)}`}>Tool record</ButtonLink>
            {canReview && <ButtonLink to="/analysis/intervals">Interval analysis</ButtonLink>}
            <Button
              variant="secondary"
              disabled={!d.series.length}
              onClick={() =>
                downloadCsv(
                  `tenthwise-drift-${d.assetTag}`,
                  [
                    { header: "checkPoint", value: (r) => r.point },
                    { header: "performedAt", value: (r) => r.performedAt },
                    { header: `errorAsFound_${d.unit}`, value: (r) => r.errorAsFound },
                    { header: "adjusted", value: (r) => (r.adjusted ? "yes" : "no") },
                    { header: `errorAsLeft_${d.unit}`, value: (r) => r.errorAsLeft },
                    { header: `mpe_${d.unit}`, value: (r) => r.mpe },
                  ],
                  d.series.flatMap((s) => s.points.map((p) => ({ ...p, point: `${s.element ? `${s.element} ` : ""}${s.nominal}` }))),
                )
              }
            >
              Export this list
            </Button>
          </>
        }
      />
      {d.flagged && (
        <p role="alert" className="rounded-md border border-stop/40 bg-stop-light px-3 py-2 font-semibold text-stop">
          ✕ At least one check point may leave tolerance before the next due date, or may already have.
        </p>
      )}
      {d.series.length === 0 ? (
        <EmptyState>No calibration points on record for this tool yet.</EmptyState>
      ) : (
        <div className="grid gap-4 xl:grid-cols-2">
          {d.series.map((s) => (
            <SeriesChart key={s.key} s={s} unit={d.unit} dueAt={d.dueAt} />
          ))}
        </div>
      )}
      <p className="text-xs text-ink-faint">
        Drift is measured over each interval, from the error the tool was left with to the error found at the next calibration, so an adjustment never hides or
        fakes a trend. The rate is a least-squares fit through those intervals; the shaded band is the rate ± k·u from their scatter (k from the t-distribution).
        It is a prompt for judgement, not a promise.
      </p>
      <Cautions compact />
    </div>
  );
}

function SeriesChart({ s, unit, dueAt }: { s: DriftSeries; unit: string; dueAt: string | null }) {
  const found = s.points.map((p) => ({ t: ms(p.performedAt), found: p.errorAsFound }));
  const left = s.points.filter((p) => p.errorAsLeft != null).map((p) => ({ t: ms(p.performedAt), left: p.errorAsLeft }));
  // One segment per interval (as left → next as found), broken at every calibration.
  const segments = s.intervals.flatMap((iv) => [
    { t: ms(iv.from), drift: iv.startError },
    { t: ms(iv.to), drift: iv.endError },
    { t: ms(iv.to) + 1, drift: null },
  ]);
  const tr = s.trend;
  const fit = tr
    ? [0, 0.25, 0.5, 0.75, 1].map((f) => {
        const t = ms(tr.startAt) + f * (ms(tr.horizonAt) - ms(tr.startAt));
        const days = (t - ms(tr.startAt)) / MS_PER_DAY;
        const spread = tr.k * tr.rateUncertaintyPerDay * days;
        const centre = tr.startError + tr.ratePerDay * days;
        return { t, fit: centre, band: [centre - spread, centre + spread] as [number, number] };
      })
    : [];
  const first = found[0]?.t ?? 0;
  const last = Math.max(found[found.length - 1]?.t ?? first, dueAt ? ms(dueAt) : 0, tr ? ms(tr.horizonAt) : 0);
  const domain: [number, number] = [first - 20 * MS_PER_DAY, last + 20 * MS_PER_DAY];
  const values = [...s.points.flatMap((p) => [p.errorAsFound, p.errorAsLeft ?? 0]), ...fit.flatMap((f) => f.band)];
  const span = Math.max(s.mpe * 1.4, ...values.map((v) => Math.min(Math.abs(v) * 1.1, s.mpe * 3)));
  const exceed = tr?.predictedExceedAt ?? null;
  const title = `${s.element ? `Element ${s.element}, ` : ""}check point ${s.nominal} ${unit}`;
  const rate = tr ? `Fitted drift ${(tr.ratePerDay * 365).toPrecision(2)} ${unit} a year ± ${(tr.k * tr.rateUncertaintyPerDay * 365).toPrecision(2)} (k = ${tr.k.toFixed(2)}).` : "";
  return (
    <Card title={title}>
      <div
        className="h-72"
        role="img"
        aria-label={`${title}: as-found errors ${s.points.map((p) => `${day(p.performedAt)} ${p.errorAsFound}${p.errorAsLeft != null ? ` (left ${p.errorAsLeft})` : ""} ${unit}`).join("; ")}; permissible error ±${s.mpe} ${unit}. ${rate} ${s.message}`}
      >
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart margin={{ top: 8, right: 12, bottom: 0, left: 8 }}>
            <CartesianGrid strokeDasharray="3 3" stroke="#d6d0c4" />
            <XAxis dataKey="t" type="number" domain={domain} ticks={monthTicks(domain[0], domain[1])} tickFormatter={(t: number) => monthLabel.format(new Date(t))} tick={{ fontSize: 11, fill: "#3b4d5e" }} scale="time" allowDuplicatedCategory={false} />
            <YAxis domain={[-span, span]} allowDataOverflow ticks={[-s.mpe, -s.mpe / 2, 0, s.mpe / 2, s.mpe]} tick={{ fontSize: 11, fill: "#3b4d5e" }} width={70} tickFormatter={(v: number) => (v === 0 ? "0" : String(Number(v.toPrecision(3))))} />
            <ReferenceArea y1={-s.mpe} y2={s.mpe} fill="#dcefe3" fillOpacity={0.5} />
            <ReferenceLine y={s.mpe} stroke="#b3261e" strokeDasharray="4 3" label={{ value: `+MPE ${s.mpe}`, fontSize: 10, fill: "#b3261e", position: "insideTopLeft" }} />
            <ReferenceLine y={-s.mpe} stroke="#b3261e" strokeDasharray="4 3" label={{ value: `−MPE`, fontSize: 10, fill: "#b3261e", position: "insideBottomLeft" }} />
            <ReferenceLine y={0} stroke="#6b7c8c" />
            {dueAt && <ReferenceLine x={ms(dueAt)} stroke="#a86a00" label={{ value: "next due", fontSize: 10, fill: "#a86a00", position: "insideTopRight" }} />}
            {exceed && <ReferenceLine x={ms(exceed)} stroke="#b3261e" strokeDasharray="2 2" label={{ value: "expected to reach MPE", fontSize: 10, fill: "#b3261e", position: "insideBottomRight" }} />}
            <Tooltip labelFormatter={(t) => new Date(Number(t)).toISOString().slice(0, 10)} formatter={(v) => [Array.isArray(v) ? v.map((x) => Number(x).toPrecision(3)).join(" to ") : `${Number(v).toPrecision(3)} ${unit}`]} />
            <Legend wrapperStyle={{ fontSize: 12 }} />
            {fit.length > 0 && <Area data={fit} dataKey="band" name="Fit ± k·u" fill="#e9d9b6" stroke="none" fillOpacity={0.7} isAnimationActive={false} />}
            {fit.length > 0 && <Line data={fit} dataKey="fit" name="Fitted drift from the last as-left" stroke="#b8862f" strokeDasharray="6 4" dot={false} isAnimationActive={false} />}
            <Line data={segments} dataKey="drift" name="Drift over an interval" stroke="#1f2f3d" strokeWidth={1.5} dot={false} connectNulls={false} isAnimationActive={false} />
            <Scatter data={found} dataKey="found" name="As found" fill="#1f2f3d" isAnimationActive={false} />
            <Scatter data={left} dataKey="left" name="As left (adjusted)" fill="#ffffff" stroke="#1f2f3d" isAnimationActive={false} />
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      {rate && <p className="mt-2 text-xs text-ink-soft">{rate}</p>}
      <p className={cx("mt-1 text-sm", s.flagged ? "font-semibold text-stop" : "text-ink-soft")}>
        {s.flagged ? "✕ " : ""}
        {s.message}
      </p>
    </Card>
  );
}
