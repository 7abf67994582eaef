import { useParams } from "react-router-dom";
import { CartesianGrid, Legend, Line, LineChart, ReferenceArea, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
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
const fmtDate = (t: number) => new Date(t).toLocaleDateString(undefined, { year: "2-digit", month: "short", timeZone: "UTC" });

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
        subtitle={`${d.description} · as-found error at each check point over time, with the permissible error band${d.dueAt ? ` · next due ${day(d.dueAt)}` : ""}`}
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
          ✕ At least one check point is predicted to leave tolerance before the next due date.
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
        The trend is a least-squares straight line through the as-found errors; it is a prompt for judgement, not a prediction to rely on. Adjustment at calibration
        resets the error; a trend across adjustments says how quickly the tool drifts.
      </p>
      <Cautions compact />
    </div>
  );
}

function SeriesChart({ s, unit, dueAt }: { s: DriftSeries; unit: string; dueAt: string | null }) {
  const points = s.points.map((p) => ({ t: ms(p.performedAt), error: p.errorAsFound }));
  const first = points[0]?.t ?? 0;
  const ends = [points[points.length - 1]?.t ?? first, dueAt ? ms(dueAt) : 0, s.trend?.predictedExceedAt ? ms(s.trend.predictedExceedAt) : 0];
  const last = Math.max(...ends);
  const trend = s.trend
    ? [first, last].map((t) => ({ t, trend: s.trend!.intercept + s.trend!.slopePerDay * ((t - ms(s.trend!.origin)) / MS_PER_DAY) }))
    : [];
  const span = Math.max(s.mpe * 1.4, ...points.map((p) => Math.abs(p.error) * 1.15));
  const title = `${s.element ? `Element ${s.element}, ` : ""}check point ${s.nominal} ${unit}`;
  return (
    <Card title={title}>
      <div className="h-64" role="img" aria-label={`${title}: as-found errors ${s.points.map((p) => `${day(p.performedAt)} ${p.errorAsFound} ${unit}`).join("; ")}; permissible error ±${s.mpe} ${unit}. ${s.message}`}>
        <ResponsiveContainer width="100%" height="100%">
          <LineChart margin={{ top: 8, right: 12, bottom: 0, left: 8 }}>
            <CartesianGrid strokeDasharray="3 3" stroke="#d6d0c4" />
            <XAxis dataKey="t" type="number" domain={[first - 15 * MS_PER_DAY, last + 15 * MS_PER_DAY]} tickFormatter={fmtDate} tick={{ fontSize: 11, fill: "#3b4d5e" }} scale="time" />
            <YAxis domain={[-span, span]} tick={{ fontSize: 11, fill: "#3b4d5e" }} width={70} tickFormatter={(v: number) => v.toPrecision(2)} />
            <ReferenceArea y1={-s.mpe} y2={s.mpe} fill="#dcefe3" fillOpacity={0.6} />
            <ReferenceLine y={s.mpe} stroke="#b3261e" strokeDasharray="4 3" label={{ value: `+MPE ${s.mpe}`, fontSize: 10, fill: "#b3261e", position: "insideTopLeft" }} />
            <ReferenceLine y={-s.mpe} stroke="#b3261e" strokeDasharray="4 3" label={{ value: `−MPE`, fontSize: 10, fill: "#b3261e", position: "insideBottomLeft" }} />
            <ReferenceLine y={0} stroke="#6b7c8c" />
            {dueAt && <ReferenceLine x={ms(dueAt)} stroke="#a86a00" label={{ value: "next due", fontSize: 10, fill: "#a86a00", position: "insideTopRight" }} />}
            <Tooltip labelFormatter={(t) => new Date(Number(t)).toISOString().slice(0, 10)} formatter={(v) => [`${Number(v).toPrecision(3)} ${unit}`]} />
            <Legend wrapperStyle={{ fontSize: 12 }} />
            <Line data={points} dataKey="error" name="As-found error" stroke="#1f2f3d" strokeWidth={2} dot={{ r: 4 }} isAnimationActive={false} />
            {trend.length > 0 && <Line data={trend} dataKey="trend" name="Trend" stroke="#b8862f" strokeDasharray="6 4" dot={false} isAnimationActive={false} />}
          </LineChart>
        </ResponsiveContainer>
      </div>
      <p className={cx("mt-2 text-sm", s.flagged ? "font-semibold text-stop" : "text-ink-soft")}>
        {s.flagged ? "✕ " : ""}
        {s.message}
      </p>
    </Card>
  );
}
